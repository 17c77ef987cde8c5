using Kit.Export;
using Kit.Tests.Views;
using Kit.Views;

namespace Kit.Tests.Export;

/// <summary>Image export's parts that need no browser: HTML-only export, file names, data URLs.</summary>
public class ExportTests
{
    static readonly IReadOnlyList<IView> Views = ReportSamples.AllViews();

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
