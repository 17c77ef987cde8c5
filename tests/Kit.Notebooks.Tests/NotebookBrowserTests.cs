using System.Text.RegularExpressions;
using Kit.Views;
using Xunit.Abstractions;

namespace Kit.Notebooks.Tests;

/// <summary>
/// Pages a person opens, in headless Chromium: the executed first-look notebook as the runner exports it, the
/// report file that notebook writes, and the same notebook executed by Jupyter and exported by nbconvert. Every
/// chart must draw — plotly's svg.main-svg inside every chart element, counted against the charts the kernel
/// sent or the views promised — and each page leaves a screenshot under TestResults/notebooks/browser.
/// </summary>
[Collection(FeedCollection.Name)]
public class NotebookBrowserTests(FeedFixture feed, ITestOutputHelper output)
{
    const string FirstLook = "01-first-look.ipynb";
    /// <summary>
    /// plotly.js (the bundle Plotly.NET 6.0.0 carries) draws each chart of the kit into three svg.main-svg layers;
    /// measured here on every chart kind the report has (15 charts, 45 layers). A chart that failed halfway has fewer.
    /// </summary>
    const int MainSvgsPerChart = 3;
    static readonly byte[] PngSignature = { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A };   // PNG specification (W3C, ISO/IEC 15948) §5.2

    [BrowserFact]
    public async Task The_executed_notebook_exported_by_the_runner_draws_every_chart()
    {
        RequiredTool.Browser.Demand();
        var run = await feed.Executed(FirstLook);
        Assert.True(run.Succeeded, run.FailureMessage);
        int expected = run.Outputs.Sum(o => ChartMarkers.Charts(o.Html));
        // The first-look notebook shows its run's report section by section: well over a dozen charts.
        Assert.True(expected >= 12, $"only {expected} charts in the executed notebook");
        string page = Path.Combine(TestArtifacts.Folder("browser"), "01-first-look.runner.html");
        run.SaveHtml(page);
        await AssertEveryChartDraws(page, expected, footer: false);
    }

    [BrowserFact]
    public async Task The_report_the_first_look_notebook_writes_draws_every_chart()
    {
        RequiredTool.Browser.Demand();
        var run = await feed.Executed(FirstLook);
        Assert.True(run.Succeeded, run.FailureMessage);
        // The notebook says "N sections, C charts → PATH" when it writes the report (C counted from the views, not the page).
        string said = run.Outputs.Select(o => o.Text).Single(t => t?.Contains(" charts → ") == true)!;
        var m = Regex.Match(said, @"(\d+) sections, (\d+) charts → (\S+\.html)");
        Assert.True(m.Success, said);
        int charts = int.Parse(m.Groups[2].Value);
        string report = Path.Combine(TestArtifacts.Folder("browser"), "01-first-look.report.html");
        File.Copy(m.Groups[3].Value, report, overwrite: true);
        File.Delete(m.Groups[3].Value);
        await AssertEveryChartDraws(report, charts, footer: true);
    }

    [JupyterAndBrowserFact]
    public async Task The_notebook_executed_by_jupyter_and_exported_by_nbconvert_draws_every_chart()
    {
        RequiredTool.Jupyter.Demand();
        RequiredTool.Browser.Demand();
        var run = await feed.ExecutedByJupyter(FirstLook);
        Assert.True(run.Result.ExitCode == 0, run.Result.Tail());
        int expected = ChartMarkers.HtmlByCodeCell(run.Executed).SelectMany(h => h).Sum(ChartMarkers.Charts);
        Assert.True(expected >= 12, $"only {expected} charts in the notebook Jupyter executed");
        string page = Path.Combine(TestArtifacts.Folder("browser"), "01-first-look.nbconvert.html");
        var export = JupyterClient.ToHtml(run.ExecutedCopy!, page);
        Assert.True(export.ExitCode == 0, export.Tail());
        // nbconvert's page template asks for MathJax, require.js and web fonts from paths and hosts this machine
        // may not have; those misses are the template's. The kit's own outputs load nothing (checked above and in
        // the report tests), so only resource misses are let through here, not script errors.
        await AssertEveryChartDraws(page, expected, footer: false, ignoreConsole: e => e.StartsWith("Failed to load resource:", StringComparison.Ordinal));
    }

    async Task AssertEveryChartDraws(string page, int expected, bool footer, Func<string, bool>? ignoreConsole = null)
    {
        string browser = HeadlessBrowser.Locate()!;
        await using var session = await HeadlessBrowser.LaunchAsync(browser);
        await using var open = await session.OpenAsync(page);
        var census = await open.CensusAsync();
        output.WriteLine($"{Path.GetFileName(page)} in {browser}: {census}");
        Assert.Empty(census.Errors);
        Assert.Equal(expected, census.Expected);
        Assert.Equal(expected, census.Drawn);
        Assert.Equal(expected, census.WithSvg);
        Assert.Equal(MainSvgsPerChart * expected, census.MainSvgs);
        if (footer) Assert.Equal(expected, census.FooterCount);
        Assert.DoesNotContain(open.ConsoleErrors, e => ignoreConsole?.Invoke(e) != true);

        string shot = Path.ChangeExtension(page, ".png");
        await open.ScreenshotAsync(shot);
        Assert.Equal(PngSignature, File.ReadAllBytes(shot)[..8]);
        output.WriteLine($"page: {page}\nscreenshot: {shot}");
    }
}
