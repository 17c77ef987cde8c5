using System.Globalization;
using System.Text;
using Kit.Views;

namespace Kit.Tools.Notebooks;

/// <summary>
/// An executed notebook as one self-contained HTML page: prose, code, outputs, and plotly.js embedded once in the
/// head. Copies of the bundle that the notebook session put into cell outputs are taken out, so the page carries
/// the library exactly once however many charts it has.
/// </summary>
public static class NotebookHtml
{
    const string CellCss = """
        .kit-cell { margin: 14px 0; }
        .kit-cell pre.kit-code { background: #F4F6F8; border-left: 3px solid var(--rule); padding: 8px 10px; font-size: 12px; overflow-x: auto; margin: 0 0 6px; }
        .kit-cell pre.kit-out { font-size: 12px; margin: 4px 0; white-space: pre-wrap; }
        .kit-cell pre.kit-error { color: #A8443A; font-size: 12px; margin: 4px 0; white-space: pre-wrap; border-left: 3px solid #A8443A; padding-left: 8px; }
        .kit-cell .kit-label { color: var(--muted); font-size: 11px; }
        .kit-status-failed { color: #A8443A; font-weight: 600; }
        """;

    public static string Render(NotebookRunResult run, string title)
    {
        var sb = new StringBuilder();
        var outputs = run.Cells.SelectMany(c => c.Outputs).ToList();
        bool charts = outputs.Any(o => o.Html?.Contains("data-kit-chart=", StringComparison.Ordinal) == true);
        sb.Append("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\">");
        sb.Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">");
        sb.Append("<title>").Append(Html.Escape(title)).Append("</title>");
        sb.Append("<style>").Append(ReportWriter.Css).Append('\n').Append(CellCss).Append("</style>");
        if (charts) sb.Append(PlotlyAsset.ScriptTag());
        sb.Append("</head><body><main>");

        int code = run.Cells.Count(c => c.Status is CellStatus.Passed or CellStatus.Failed);
        sb.Append("<header class=\"kit-head\"><h1>").Append(Html.Escape(title)).Append("</h1><p>")
          .Append(Html.Escape(Path.GetFileName(run.Path))).Append(" · ")
          .Append(code.ToString(CultureInfo.InvariantCulture)).Append(" code cells run in ")
          .Append(run.Elapsed.TotalSeconds.ToString("F1", CultureInfo.InvariantCulture)).Append(" s · ");
        sb.Append(run.Failure is { } f
            ? $"<span class=\"kit-status-failed\">stopped: cell {f.Number} failed</span>"
            : "all cells passed");
        sb.Append("</p></header>");

        foreach (var cell in run.Cells)
        {
            sb.Append("<div class=\"kit-cell\" data-cell=\"").Append(cell.Number).Append("\">");
            if (cell.Status == CellStatus.Text)
            {
                sb.Append(MarkdownLite.ToHtml(cell.Source)).Append("</div>");
                continue;
            }
            sb.Append("<div class=\"kit-label\">cell ").Append(cell.Number).Append(cell.Status switch
            {
                CellStatus.Failed => " · failed",
                CellStatus.NotRun => " · not run",
                _ => "",
            }).Append("</div>");
            sb.Append("<pre class=\"kit-code\"><code>").Append(Html.Escape(cell.Source)).Append("</code></pre>");
            foreach (var o in cell.Outputs)
            {
                if (o.Kind == CellOutput.Error)
                    sb.Append("<pre class=\"kit-error\">").Append(Html.Escape(o.Text)).Append("</pre>");
                else if (o.Html is { } html)
                    sb.Append("<div class=\"kit-out\">").Append(WithoutBundle(html)).Append("</div>");
                else if (o.Text is { } text)
                    sb.Append("<pre class=\"kit-out\">").Append(Html.Escape(text)).Append("</pre>");
            }
            sb.Append("</div>");
        }

        sb.Append("<footer class=\"kit-cautions\"><strong>Cautions.</strong><ul>");
        foreach (var line in Cautions.Lines) sb.Append("<li>").Append(Html.Escape(line)).Append("</li>");
        sb.Append("</ul></footer></main></body></html>");
        return sb.ToString();
    }

    /// <summary>Removes embedded plotly.js bundles (the tag carries <see cref="PlotlyAsset.Marker"/>).</summary>
    public static string WithoutBundle(string html)
    {
        string open = $"<script data-role=\"{PlotlyAsset.Marker}\"";
        var sb = new StringBuilder();
        int from = 0;
        while (true)
        {
            int start = html.IndexOf(open, from, StringComparison.Ordinal);
            if (start < 0) break;
            // The bundle's own "</script" sequences are escaped when embedded, so the first close tag ends it.
            int end = html.IndexOf("</script>", start, StringComparison.OrdinalIgnoreCase);
            if (end < 0) break;
            sb.Append(html, from, start - from);
            from = end + "</script>".Length;
        }
        return sb.Append(html, from, html.Length - from).ToString();
    }
}
