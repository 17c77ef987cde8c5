using System.Globalization;
using System.Text;
using Kit.Common;

namespace Kit.Views;

/// <summary>
/// Turns a list of views into one self-contained HTML file: styles inline, plotly.js embedded once for the
/// whole page (not per chart), no network needed, and print rules so the page reads well as a PDF.
/// </summary>
public static class ReportWriter
{
    public const string Css = """
        :root { --ink:#1F2933; --muted:#6B7785; --rule:#E4E7EB; --accent:#025849; }
        body { font-family: Inter, Roboto, Helvetica, Arial, sans-serif; color: var(--ink); margin: 0; background: #FBFCFD; }
        main { max-width: 1040px; margin: 0 auto; padding: 24px 32px 48px; background: #FFFFFF; }
        header.kit-head { border-bottom: 3px solid var(--accent); margin-bottom: 16px; padding-bottom: 8px; }
        header.kit-head h1 { font-size: 24px; margin: 0 0 4px; }
        header.kit-head p { color: var(--muted); margin: 0; }
        section.kit-section { margin: 28px 0; break-inside: avoid; }
        section.kit-section h2 { font-size: 17px; border-left: 4px solid var(--accent); padding-left: 8px; margin: 0 0 10px; }
        figure.kit-chart { margin: 0; }
        /* The plot toolbar appears on hover only, so it never covers a title in a screenshot or on paper. */
        .kit-plot .modebar-container { opacity: 0; transition: opacity .15s; } .kit-plot:hover .modebar-container { opacity: 1; }
        figure.kit-chart figcaption { color: var(--muted); font-size: 12px; margin-top: 4px; }
        table.kit-table { border-collapse: collapse; font-size: 13px; margin: 6px 0 12px; }
        table.kit-table caption { text-align: left; color: var(--muted); padding-bottom: 4px; }
        table.kit-table th { text-align: left; border-bottom: 2px solid var(--ink); padding: 4px 10px; }
        table.kit-table td { border-bottom: 1px solid var(--rule); padding: 3px 10px; }
        table.kit-table td.num { text-align: right; font-variant-numeric: tabular-nums; }
        .kit-stack > * + * { margin-top: 14px; }
        p.kit-ok { color: #2F6E55; } p.kit-warn { color: #A8443A; font-weight: 600; }
        p.kit-occlusion { font-family: 'DejaVu Sans Mono', Consolas, monospace; font-size: 15px; line-height: 2; white-space: pre-wrap; word-break: break-all; }
        span.kit-token { padding: 2px 1px; border-radius: 2px; -webkit-print-color-adjust: exact; print-color-adjust: exact; }
        span.kit-unknown { text-decoration: underline dotted; }
        p.kit-legend { color: var(--muted); font-size: 12px; }
        p.kit-legend span.kit-token { color: var(--ink); padding: 1px 4px; }
        footer.kit-cautions { border-top: 1px solid var(--rule); margin-top: 36px; padding-top: 10px; color: var(--muted); font-size: 12px; }
        @media print { body { background: #FFFFFF; } main { max-width: none; padding: 0; } section.kit-section { page-break-inside: avoid; } figure.kit-chart { page-break-inside: avoid; } .modebar-container { display: none; } }
        """;

    public static string Render(string title, string subtitle, IEnumerable<IView> views)
    {
        var sb = new StringBuilder();
        sb.Append("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\">");
        sb.Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">");
        sb.Append("<title>").Append(Html.Escape(title)).Append("</title>");
        sb.Append("<style>").Append(Css).Append("</style>");
        sb.Append(PlotlyAsset.ScriptTag());
        sb.Append("</head><body><main>");
        sb.Append("<header class=\"kit-head\"><h1>").Append(Html.Escape(title)).Append("</h1><p>")
          .Append(Html.Escape(subtitle)).Append("</p></header>");
        int charts = 0;
        foreach (var view in views)
        {
            if (view is IChartView c) charts += c.ChartCount;
            sb.Append("<section class=\"kit-section\"><h2>").Append(Html.Escape(view.Title)).Append("</h2>")
              .Append(view.ToHtml()).Append("</section>");
        }
        sb.Append("<footer class=\"kit-cautions\"><strong>Cautions.</strong><ul>");
        foreach (var line in Cautions.Lines) sb.Append("<li>").Append(Html.Escape(line)).Append("</li>");
        sb.Append("</ul><p>Written ")
          .Append(DateTime.UtcNow.ToString("yyyy-MM-dd HH:mm 'UTC'", CultureInfo.InvariantCulture))
          .Append($" · plotly.js {Html.Escape(PlotlyAsset.Version)} embedded · <span data-kit-charts=\"{charts}\">{charts} charts</span></p></footer>");
        sb.Append("</main></body></html>");
        return sb.ToString();
    }

    public static void Write(string path, string title, string subtitle, IEnumerable<IView> views) =>
        AtomicFile.WriteAllText(path, Render(title, subtitle, views));
}
