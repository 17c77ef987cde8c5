using System.Text.RegularExpressions;
using Kit.Views;

namespace Kit.Tests.Views;

public class ReportTests
{
    static readonly IReadOnlyList<IView> Views = ReportSamples.AllViews();
    static readonly string Page = ReportWriter.Render("Report with </script><b>hostile</b> title", "sub & title", Views);

    /// <summary>The page with the embedded plotly.js removed, so checks on our own markup are not confused by the bundle's code.</summary>
    static string OurMarkup()
    {
        int open = Page.IndexOf($"<script data-role=\"{PlotlyAsset.Marker}\"", StringComparison.Ordinal);
        int close = Page.IndexOf("</script>", open, StringComparison.Ordinal);
        return Page[..open] + Page[(close + "</script>".Length)..];
    }

    [Fact]
    public void Many_charts_share_one_embedded_plotly_bundle()
    {
        int charts = ReportSamples.ChartCount(Views);
        Assert.True(charts >= 15, $"only {charts} charts in the sample report");
        Assert.Single(Regex.Matches(Page, Regex.Escape($"data-role=\"{PlotlyAsset.Marker}\"")));
        // The bundle's own licence banner appears once: a second copy would repeat it.
        string banner = PlotlyAsset.Script[..Math.Min(60, PlotlyAsset.Script.Length)];
        Assert.Single(Regex.Matches(Page, Regex.Escape(banner)));
        Assert.Equal(charts, Regex.Matches(Page, "data-kit-chart=\"1\"").Count);
        Assert.Contains($"data-kit-charts=\"{charts}\"", Page);
        Assert.True(Page.Length > PlotlyAsset.Script.Length, "the bundle is embedded, not linked");
    }

    [Fact]
    public void The_page_loads_nothing_from_the_network()
    {
        string ours = OurMarkup();
        Assert.Empty(Regex.Matches(ours, @"<(script|link|img|iframe|object|embed|source|video|audio)\b[^>]*\b(src|href|data)\s*=", RegexOptions.IgnoreCase));
        Assert.DoesNotContain("@import", ours);
        Assert.DoesNotMatch(@"url\(\s*['""]?(https?:)?//", ours);
        Assert.DoesNotMatch(@"\b(src|href)\s*=\s*['""]?(https?:)?//", ours);
    }

    [Fact]
    public void Hostile_text_is_escaped_everywhere_it_is_shown()
    {
        string ours = OurMarkup();
        Assert.DoesNotContain(ViewSamples.Hostile, ours);
        Assert.DoesNotContain("</script><b>hostile", ours);
        Assert.Contains("Report with &lt;/script&gt;&lt;b&gt;hostile&lt;/b&gt; title", ours);
        Assert.Contains("sub &amp; title", ours);
        // Every <script> we open is closed exactly once: no text from the data closed one early.
        Assert.Equal(Regex.Matches(ours, "<script").Count, Regex.Matches(ours, "</script>").Count);
        Assert.Equal(ReportSamples.ChartCount(Views), Regex.Matches(ours, "<script>").Count);
    }

    [Fact]
    public void Print_rules_keep_charts_and_coloured_tokens_readable_on_paper()
    {
        Assert.Contains("@media print", ReportWriter.Css);
        Assert.Contains("print-color-adjust: exact", ReportWriter.Css);
        Assert.Contains("page-break-inside: avoid", ReportWriter.Css);
    }
}
