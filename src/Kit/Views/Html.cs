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

    /// <summary>A plain table; the first row of <paramref name="rows"/> is data, headers come separately.</summary>
    public static string Table(IReadOnlyList<string> headers, IEnumerable<IReadOnlyList<string>> rows, string? caption = null, bool numericRight = true)
    {
        var sb = new StringBuilder("<table class=\"kit-table\">");
        if (caption is not null) sb.Append("<caption>").Append(Escape(caption)).Append("</caption>");
        sb.Append("<thead><tr>");
        foreach (var h in headers) sb.Append("<th>").Append(Escape(h)).Append("</th>");
        sb.Append("</tr></thead><tbody>");
        foreach (var row in rows)
        {
            sb.Append("<tr>");
            foreach (var cell in row)
            {
                bool numeric = numericRight && cell.Length > 0 && (char.IsDigit(cell[0]) || cell[0] == '-' || cell[0] == '–');
                sb.Append(numeric ? "<td class=\"num\">" : "<td>").Append(Escape(cell)).Append("</td>");
            }
            sb.Append("</tr>");
        }
        return sb.Append("</tbody></table>").ToString();
    }
}
