using System.Globalization;
using System.Text;
using Kit.Common;
using Kit.Views;

namespace Kit.Export;

/// <summary>
/// Saves a report or a single chart: HTML always (self-contained, plotly.js embedded once), and, when a
/// Chromium is installed, each chart as SVG and PNG plus the whole report as a full-page PNG and a PDF. Where
/// no browser is found the result says so plainly and the HTML is still there.
/// </summary>
public static class ReportExport
{
    public const string ReportFile = "report.html";
    public const string ChartsFolder = "charts";

    /// <param name="images">Draw the SVG/PNG/PDF files when a browser is available.</param>
    /// <param name="browser">Browser executable; null looks one up (<see cref="HeadlessBrowser.Locate"/>).</param>
    public static async Task<ExportResult> WriteReportAsync(string folder, string title, string subtitle, IReadOnlyList<IView> views,
        bool images = true, string? browser = null, CancellationToken cancel = default)
    {
        Directory.CreateDirectory(folder);
        string html = Path.Combine(folder, ReportFile);
        ReportWriter.Write(html, title, subtitle, views);
        var files = new List<string> { html };
        if (!images) return new ExportResult(files, null, $"wrote {html}; images not asked for.");
        browser ??= HeadlessBrowser.Locate();
        if (browser is null) return new ExportResult(files, null, $"wrote {html}; {HeadlessBrowser.NotFoundMessage}");

        var charts = StackView.ChartsIn(views).ToArray();
        await using var session = await HeadlessBrowser.LaunchAsync(browser, cancel).ConfigureAwait(false);
        await using var page = await session.OpenAsync(html).ConfigureAwait(false);
        var census = await page.CensusAsync().ConfigureAwait(false);
        if (!census.AllDrawn)
            throw new InvalidOperationException(
                $"{html}: {census.Drawn} of {census.Expected} charts drew in {browser}" + (census.Errors.Count > 0 ? $"; plotly.js said: {string.Join("; ", census.Errors)}" : ""));
        string png = Path.Combine(folder, "report.png"), pdf = Path.Combine(folder, "report.pdf");
        await page.ScreenshotAsync(png).ConfigureAwait(false);
        await page.PdfAsync(pdf).ConfigureAwait(false);
        files.Add(png);
        files.Add(pdf);
        string chartDir = Path.Combine(folder, ChartsFolder);
        Directory.CreateDirectory(chartDir);
        for (int i = 0; i < charts.Length; i++)
        {
            cancel.ThrowIfCancellationRequested();
            string stem = Path.Combine(chartDir, $"{(i + 1).ToString("D2", CultureInfo.InvariantCulture)}-{Slug(charts[i].Title)}");
            files.AddRange(await SaveImagesAsync(page, i, stem).ConfigureAwait(false));
        }
        return new ExportResult(files, browser, $"wrote {files.Count} files to {folder} (report, PDF and {charts.Length} charts as SVG and PNG) with {browser}");
    }

    /// <summary>One chart: <c>name.html</c> (a page of its own), plus <c>name.svg</c> and <c>name.png</c> when a browser exists.</summary>
    public static async Task<ExportResult> WriteChartAsync(ChartView chart, string folder, string? name = null, bool images = true,
        string? browser = null, CancellationToken cancel = default)
    {
        Directory.CreateDirectory(folder);
        string stem = Path.Combine(folder, name ?? Slug(chart.Title));
        string html = stem + ".html";
        ReportWriter.Write(html, chart.Title, "", new IView[] { chart });
        var files = new List<string> { html };
        if (!images) return new ExportResult(files, null, $"wrote {html}; images not asked for.");
        browser ??= HeadlessBrowser.Locate();
        if (browser is null) return new ExportResult(files, null, $"wrote {html}; {HeadlessBrowser.NotFoundMessage}");
        await using var session = await HeadlessBrowser.LaunchAsync(browser, cancel).ConfigureAwait(false);
        await using var page = await session.OpenAsync(html).ConfigureAwait(false);
        var census = await page.CensusAsync().ConfigureAwait(false);
        if (!census.AllDrawn) throw new InvalidOperationException($"{html}: the chart did not draw in {browser}: {string.Join("; ", census.Errors)}");
        files.AddRange(await SaveImagesAsync(page, 0, stem).ConfigureAwait(false));
        return new ExportResult(files, browser, $"wrote {string.Join(", ", files)} with {browser}");
    }

    /// <summary>Blocking form of <see cref="WriteReportAsync"/> for scripts and the command line.</summary>
    public static ExportResult WriteReport(string folder, string title, string subtitle, IReadOnlyList<IView> views, bool images = true, string? browser = null) =>
        WriteReportAsync(folder, title, subtitle, views, images, browser).GetAwaiter().GetResult();

    public static ExportResult WriteChart(ChartView chart, string folder, string? name = null, bool images = true, string? browser = null) =>
        WriteChartAsync(chart, folder, name, images, browser).GetAwaiter().GetResult();

    static async Task<string[]> SaveImagesAsync(BrowserPage page, int index, string stem)
    {
        var svg = await page.ChartImageAsync(index, ChartImageFormat.Svg).ConfigureAwait(false);
        var png = await page.ChartImageAsync(index, ChartImageFormat.Png).ConfigureAwait(false);
        AtomicFile.WriteAllBytes(stem + ".svg", svg);
        AtomicFile.WriteAllBytes(stem + ".png", png);
        return new[] { stem + ".svg", stem + ".png" };
    }

    /// <summary>A file-name-safe, lower-case form of a title ("Reliability (equal-width)" → "reliability-equal-width").</summary>
    internal static string Slug(string title)
    {
        var sb = new StringBuilder();
        foreach (char c in title.ToLowerInvariant())
        {
            if (c is >= 'a' and <= 'z' or >= '0' and <= '9') sb.Append(c);
            else if (sb.Length > 0 && sb[^1] != '-') sb.Append('-');
        }
        string s = sb.ToString().Trim('-');
        return s.Length == 0 ? "chart" : s.Length > 60 ? s[..60].TrimEnd('-') : s;
    }
}
