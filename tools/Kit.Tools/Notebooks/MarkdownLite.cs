using System.Text;
using System.Text.RegularExpressions;
using Kit.Views;

namespace Kit.Tools.Notebooks;

/// <summary>
/// Enough Markdown for the prose cells of an exported notebook: headings, paragraphs, bullet and numbered lists,
/// fenced code, inline code, bold, italics and links. Everything is escaped first, so cell text cannot inject markup.
/// </summary>
public static partial class MarkdownLite
{
    public static string ToHtml(string markdown)
    {
        var sb = new StringBuilder();
        var paragraph = new List<string>();
        string? list = null;
        bool inCode = false;

        void CloseParagraph()
        {
            if (paragraph.Count > 0) sb.Append("<p>").Append(Inline(string.Join(" ", paragraph))).Append("</p>");
            paragraph.Clear();
        }
        void CloseList()
        {
            if (list is not null) sb.Append("</").Append(list).Append('>');
            list = null;
        }

        foreach (var raw in markdown.Replace("\r\n", "\n").Split('\n'))
        {
            string line = raw.TrimEnd();
            if (line.TrimStart().StartsWith("```", StringComparison.Ordinal))
            {
                CloseParagraph(); CloseList();
                sb.Append(inCode ? "</code></pre>" : "<pre><code>");
                inCode = !inCode;
                continue;
            }
            if (inCode) { sb.Append(Html.Escape(raw)).Append('\n'); continue; }
            if (line.Length == 0) { CloseParagraph(); CloseList(); continue; }

            var heading = HeadingPattern().Match(line);
            var bullet = BulletPattern().Match(line);
            var numbered = NumberedPattern().Match(line);
            if (heading.Success)
            {
                CloseParagraph(); CloseList();
                int level = heading.Groups[1].Length;
                sb.Append($"<h{level}>").Append(Inline(heading.Groups[2].Value)).Append($"</h{level}>");
            }
            else if (bullet.Success || numbered.Success)
            {
                CloseParagraph();
                string kind = bullet.Success ? "ul" : "ol";
                if (list != kind) { CloseList(); sb.Append('<').Append(kind).Append('>'); list = kind; }
                sb.Append("<li>").Append(Inline((bullet.Success ? bullet : numbered).Groups[1].Value)).Append("</li>");
            }
            else
            {
                CloseList();
                paragraph.Add(line.Trim());
            }
        }
        if (inCode) sb.Append("</code></pre>");
        CloseParagraph(); CloseList();
        return sb.ToString();
    }

    static string Inline(string text)
    {
        string s = Html.Escape(text);
        s = CodePattern().Replace(s, "<code>$1</code>");
        s = BoldPattern().Replace(s, "<strong>$1</strong>");
        s = ItalicPattern().Replace(s, "<em>$1</em>");
        // Only http(s) and relative links: a javascript: target would run in the exported page.
        s = LinkPattern().Replace(s, m =>
        {
            string href = m.Groups[2].Value;
            bool safe = href.StartsWith("http://", StringComparison.OrdinalIgnoreCase) ||
                        href.StartsWith("https://", StringComparison.OrdinalIgnoreCase) || !href.Contains(':');
            return safe ? $"<a href=\"{href}\">{m.Groups[1].Value}</a>" : m.Groups[1].Value;
        });
        return s;
    }

    [GeneratedRegex(@"^(#{1,6})\s+(.*)$")] private static partial Regex HeadingPattern();
    [GeneratedRegex(@"^\s*[-*+]\s+(.*)$")] private static partial Regex BulletPattern();
    [GeneratedRegex(@"^\s*\d+[.)]\s+(.*)$")] private static partial Regex NumberedPattern();
    [GeneratedRegex(@"`([^`]+)`")] private static partial Regex CodePattern();
    [GeneratedRegex(@"\*\*([^*]+)\*\*")] private static partial Regex BoldPattern();
    [GeneratedRegex(@"(?<![*\w])\*([^*\s][^*]*)\*(?![*\w])")] private static partial Regex ItalicPattern();
    [GeneratedRegex(@"\[([^\]]+)\]\(([^)\s]+)\)")] private static partial Regex LinkPattern();
}
