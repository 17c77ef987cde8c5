using System.Globalization;
using System.Net;
using System.Text;

namespace Kit.Views;

/// <summary>Small HTML helpers shared by the views: escaping and number formatting in one place.</summary>
public static class Html
{
    public static string Escape(string? s) => WebUtility.HtmlEncode(s ?? "");

    public static string Num(double v, int digits = 3) =>
        double.IsNaN(v) ? "–" : v.ToString("F" + digits, CultureInfo.InvariantCulture);

    public static string Pct(double v, int digits = 1) =>
        double.IsNaN(v) ? "–" : (100 * v).ToString("F" + digits, CultureInfo.InvariantCulture) + " %";

    /// <summary>A whole count with thousands separators, the same on every machine.</summary>
    public static string Count(long v) => v.ToString("N0", CultureInfo.InvariantCulture);

    /// <summary>
    /// A plain table; the first row of <paramref name="rows"/> is data, headers come separately. Cells that read
    /// as numbers (digits with optional sign, separators, decimals and a percent sign, or "–") are right-aligned
    /// unless their column is listed in <paramref name="textColumns"/> (texts such as hostnames or tokens, which
    /// may happen to be digits).
    /// </summary>
    public static string Table(IReadOnlyList<string> headers, IEnumerable<IReadOnlyList<string>> rows, string? caption = null, bool numericRight = true,
        IReadOnlyCollection<int>? textColumns = null)
    {
        var sb = new StringBuilder("<table class=\"kit-table\">");
        if (caption is not null) sb.Append("<caption>").Append(Escape(caption)).Append("</caption>");
        sb.Append("<thead><tr>");
        foreach (var h in headers) sb.Append("<th>").Append(Escape(h)).Append("</th>");
        sb.Append("</tr></thead><tbody>");
        foreach (var row in rows)
        {
            sb.Append("<tr>");
            for (int c = 0; c < row.Count; c++)
            {
                string cell = row[c];
                bool numeric = numericRight && textColumns?.Contains(c) != true && LooksNumeric(cell);
                sb.Append(numeric ? "<td class=\"num\">" : "<td>").Append(Escape(cell)).Append("</td>");
            }
            sb.Append("</tr>");
        }
        return sb.Append("</tbody></table>").ToString();
    }

    static readonly System.Text.RegularExpressions.Regex NumberPattern =
        new(@"^(–|[-+]?[\d,]*\.?\d+( ?%)?)$", System.Text.RegularExpressions.RegexOptions.CultureInvariant);

    internal static bool LooksNumeric(string cell) => cell.Length > 0 && NumberPattern.IsMatch(cell);
}
