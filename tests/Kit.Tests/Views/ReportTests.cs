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

    [Fact]
    public void Export_writes_the_html_and_says_plainly_when_no_browser_is_asked_for()
    {
        string dir = Directory.CreateTempSubdirectory("kit-export-").FullName;
        var result = ReportExport.WriteReport(dir, "t", "s", Views, images: false);
        Assert.Equal(new[] { Path.Combine(dir, ReportExport.ReportFile) }, result.Files);
        Assert.False(result.ImagesWritten);
        Assert.Contains(PlotlyAsset.Marker, File.ReadAllText(result.Files[0]));
        var chart = StackView.ChartsIn(Views).First();
        var one = ReportExport.WriteChart(chart, dir, "first", images: false);
        Assert.Equal(Path.Combine(dir, "first.html"), Assert.Single(one.Files));
    }

    [Fact]
    public void Slugs_are_safe_file_names()
    {
        Assert.Equal("reliability-equal-width", ReportExport.Slug("Reliability (equal-width)"));
        Assert.Equal("script-b-x-b", ReportExport.Slug("</script><b>x</b>"));
        Assert.Equal("chart", ReportExport.Slug("—"));
    }

    [Fact]
    public void Data_urls_decode_both_encodings()
    {
        Assert.Equal("<svg a=\"1\"/>", System.Text.Encoding.UTF8.GetString(BrowserPage.DecodeDataUrl("data:image/svg+xml,%3Csvg%20a%3D%221%22%2F%3E")));
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47 }, BrowserPage.DecodeDataUrl("data:image/png;base64,iVBORw=="));
        Assert.Throws<InvalidOperationException>(() => BrowserPage.DecodeDataUrl("http://x"));
    }
}
