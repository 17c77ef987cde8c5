using Kit.Export;
using Kit.Views;
using Kit.Tests.Views;
using Xunit.Abstractions;

namespace Kit.Tests.Export;

[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class BrowserCollection
{
    public const string Name = "headless browser";
}

/// <summary>
/// The report opened in a real headless Chromium: every chart must draw (plotly's svg.main-svg inside each
/// chart element, counted against the charts the views promised), and a screenshot is left for a person to see.
/// </summary>
[Collection(BrowserCollection.Name)]
public class BrowserTests(ITestOutputHelper output)
{
    static readonly byte[] PngMagic = { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A };   // PNG spec (W3C/ISO 15948) §5.2

    /// <summary>Test artifacts go beside the test binaries, under TestResults, so CI can collect them.</summary>
    public static string ArtifactFolder()
    {
        string dir = Path.Combine(AppContext.BaseDirectory, "TestResults", "views");
        Directory.CreateDirectory(dir);
        return dir;
    }

    [BrowserFact]
    public async Task Report_draws_every_chart_in_headless_chromium_and_leaves_a_screenshot()
    {
        string browser = BrowserFactAttribute.Browser();
        var views = ReportSamples.AllViews();
        int expected = ReportSamples.ChartCount(views);
        string dir = ArtifactFolder();
        string html = Path.Combine(dir, "sample-report.html");
        ReportWriter.Write(html, "Sample report", "every view, invented data", views);

        await using var session = await HeadlessBrowser.LaunchAsync(browser);
        await using var page = await session.OpenAsync(html);
        var census = await page.CensusAsync();
        output.WriteLine($"{browser}: {census}");
        Assert.Equal(expected, census.Expected);
        Assert.Equal(expected, census.Drawn);
        Assert.Equal(expected, census.WithSvg);
        Assert.Equal(expected, census.FooterCount);
        Assert.True(census.MainSvgs >= expected, $"{census.MainSvgs} svg.main-svg for {expected} charts");
        Assert.Empty(census.Errors);
        Assert.Empty(page.ConsoleErrors);

        // The hostile class name reaches the screen as literal text, not as markup.
        var ticks = await page.TextsAsync(".xtick text, .ytick text");
        Assert.Contains(ticks, t => t.Contains(ViewSamples.Hostile, StringComparison.Ordinal));

        string shot = Path.Combine(dir, "sample-report.png");
        await page.ScreenshotAsync(shot);
        Assert.Equal(PngMagic, File.ReadAllBytes(shot)[..8]);
        output.WriteLine($"screenshot: {shot}");
    }

    [BrowserFact]
    public async Task Charts_draw_on_a_page_that_already_has_an_AMD_loader()
    {
        // The classic notebook and some nbconvert templates load require.js; plotly.js's UMD wrapper would then
        // register with it instead of setting window.Plotly. A stand-in loader is enough to trigger that branch.
        string browser = BrowserFactAttribute.Browser();
        var views = ReportSamples.AllViews().OfType<IChartView>().Take(2).Cast<IView>().ToList();
        int expected = ReportSamples.ChartCount(views);
        string html = Path.Combine(ArtifactFolder(), "amd-loader-page.html");
        string page = ReportWriter.Render("AMD loader present", "require.js stand-in before the bundle", views)
            .Replace("<head>", "<head><script>window.define = function () { window.kitAmdCalls = (window.kitAmdCalls || 0) + 1; }; window.define.amd = {};</script>", StringComparison.Ordinal);
        File.WriteAllText(html, page);

        await using var session = await HeadlessBrowser.LaunchAsync(browser);
        await using var tab = await session.OpenAsync(html);
        var census = await tab.CensusAsync();
        output.WriteLine($"{browser}: {census}");
        Assert.Equal(expected, census.Drawn);
        Assert.Empty(census.Errors);
    }

    [BrowserFact]
    public async Task Export_writes_html_svg_png_and_pdf_when_a_browser_exists()
    {
        string browser = BrowserFactAttribute.Browser();
        var views = ReportSamples.AllViews().Take(8).ToArray();
        string dir = Path.Combine(ArtifactFolder(), "export");
        if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true);
        var result = await ReportExport.WriteReportAsync(dir, "Export", "sample", views, browser: browser);
        output.WriteLine(result.Message);
        Assert.Equal(browser, result.Browser);
        Assert.True(result.ImagesWritten);
        int charts = ReportSamples.ChartCount(views);
        var svgs = result.Files.Where(f => f.EndsWith(".svg", StringComparison.Ordinal)).ToArray();
        var pngs = result.Files.Where(f => f.EndsWith(".png", StringComparison.Ordinal) && !f.EndsWith("report.png", StringComparison.Ordinal)).ToArray();
        Assert.Equal(charts, svgs.Length);
        Assert.Equal(charts, pngs.Length);
        foreach (var svg in svgs)
        {
            string text = File.ReadAllText(svg);
            Assert.StartsWith("<svg", text);
            Assert.Contains("class=\"main-svg\"", text);
            // Well-formed XML, or an SVG viewer (and the PNG path, which loads the SVG as an image) rejects it.
            Assert.Equal("svg", System.Xml.Linq.XDocument.Parse(text).Root!.Name.LocalName);
        }
        foreach (var png in pngs.Append(Path.Combine(dir, "report.png"))) Assert.Equal(PngMagic, File.ReadAllBytes(png)[..8]);
        Assert.Equal("%PDF-"u8.ToArray(), File.ReadAllBytes(Path.Combine(dir, "report.pdf"))[..5]);   // ISO 32000-1 §7.5.2 header

        var single = await ReportExport.WriteChartAsync(StackView.ChartsIn(views).First(), dir, "single", browser: browser);
        Assert.Equal(new[] { "single.html", "single.svg", "single.png" }, single.Files.Select(Path.GetFileName));
    }

    [Fact]
    public void Export_without_a_browser_still_writes_html_and_says_what_to_install()
    {
        string? saved = Environment.GetEnvironmentVariable(HeadlessBrowser.PathVariable);
        try
        {
            Environment.SetEnvironmentVariable(HeadlessBrowser.PathVariable, "/nonexistent/kit-no-browser");
            Assert.Null(HeadlessBrowser.Locate());
            string dir = Directory.CreateTempSubdirectory("kit-nobrowser-").FullName;
            var result = ReportExport.WriteReport(dir, "t", "s", ReportSamples.AllViews().Take(3).ToArray());
            Assert.Null(result.Browser);
            Assert.False(result.ImagesWritten);
            Assert.Equal(new[] { "report.html" }, result.Files.Select(Path.GetFileName));
            Assert.Contains("no Chromium found", result.Message);
            Assert.Contains("apt-get install chromium", result.Message);
            Assert.True(new FileInfo(result.Files[0]).Length > PlotlyAsset.Script.Length);
            Assert.Empty(Directory.GetFiles(dir, "*.png"));
        }
        finally
        {
            Environment.SetEnvironmentVariable(HeadlessBrowser.PathVariable, saved);
        }
    }
}
