using Kit.Data;
using Kit.Experiments;
using Kit.Export;
using Kit.Tests.Experiments;
using Kit.Tests.Views;
using Kit.Training;
using Kit.Views;
using Xunit.Abstractions;

namespace Kit.Tests.Export;

/// <summary>
/// The two pages users paste from, at the sizes real work has, opened in headless Chromium: a run report with 45
/// classes (Princeton WordNet 3.0 glosses → the lexicographer file their synset is filed under; Miller 1995,
/// Fellbaum 1998; see <see cref="WordNetSets.GlossesByFile"/>) and the report of a six-config comparison with both
/// baselines. Every chart must draw, and the rendered SVG is read back (<see cref="ChartLayout"/>): no two tick labels
/// on one axis read the same, no two titles, annotations or legends overlap, and no text is cut off at a chart's
/// edge. Pages and full-page screenshots stay under TestResults/views/real-size for a person to look at.
/// </summary>
[Collection(BrowserCollection.Name)]
public sealed class RealSizeBrowserTests(ITestOutputHelper output) : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-real-size-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    static string Artifacts()
    {
        string dir = Path.Combine(BrowserTests.ArtifactFolder(), "real-size");
        Directory.CreateDirectory(dir);
        return dir;
    }

    [BrowserFact]
    public async Task A_45_class_run_report_draws_every_chart_with_distinct_ticks_and_no_overlapping_or_clipped_text()
    {
        string browser = BrowserFactAttribute.Browser();
        if (WordNetGate.FolderOrSkip(output) is not { } folder) return;
        var rows = WordNetSets.GlossesByFile(folder);
        // WordNet 3.0 files its synsets under 45 lexicographer files (lexnames(5WN): numbers 00–44).
        Assert.Equal(45, rows.Select(r => r.Label).Distinct().Count());
        string csv = WordNetSets.WriteCsv(rows, Path.Combine(_dir, "wordnet-gloss-file.csv"), folder);

        var spec = new RunSpec
        {
            DataPath = csv, Tokenizer = TokenizerKind.Word, SampleRows = 12_000, EmbeddingSize = 48, HiddenSize = 64, Pooling = Kit.Models.PoolingKind.Max,
            Training = new TrainingOptions { Epochs = 3, BatchSize = 64, Seed = 3 },
            Diagnostics = new DiagnosticsOptions { ProjectionMaxPoints = 800, TsneIterations = 300, BootstrapReplicates = 200 },
        };
        var run = SingleRun.Execute(spec);
        output.WriteLine(run.ToString());
        Assert.Equal(45, run.Labels.Count);
        var report = RunReport.Of(run, title: "WordNet glosses → lexicographer file (45 classes)", subtitle: "a 12,000-row sample, word GRU, 3 epochs");
        string page = Path.Combine(Artifacts(), "wordnet-45-class-run.html");
        report.Write(page);
        await AssertReadable(browser, page, ReportSamples.ChartCount(report.Views));
    }

    [BrowserFact]
    public async Task A_six_config_comparison_report_draws_every_chart_with_distinct_ticks_and_no_overlapping_or_clipped_text()
    {
        string browser = BrowserFactAttribute.Browser();
        string results = Path.Combine(_dir, "compare");
        var (code, stdout, stderr) = KitCli.Run([
            "compare", KitCli.DemoHostnames, "--group", "group", "--sample", "3000", "--epochs", "2", "--embed", "16", "--hidden", "32",
            "--grid", "cell=gru,lstm,rnn; bidirectional=false,true", "--out", results], timeoutSeconds: 1200);
        output.WriteLine(stdout);
        Assert.True(code == 0, $"kit compare exited {code}\n{stderr}\n{stdout}");
        string page = Path.Combine(Artifacts(), "six-config-comparison.html");
        File.Copy(Path.Combine(results, "report.html"), page, overwrite: true);
        // Six neural configs and the two baselines, each a row of the summary.
        var contents = ResultsStore.Read(results);
        Assert.Equal(8, contents.Records.Select(r => r.Config).Distinct().Count());
        await AssertReadable(browser, page, ReportSamples.ChartCount(ComparisonReport.Views(ComparisonRecord.Build(contents.Records, contents.Notes))));
    }

    /// <summary>Every chart drew; nothing on any chart reads wrong, overlaps or is cut off; screenshot saved beside the page.</summary>
    async Task AssertReadable(string browser, string page, int expected)
    {
        await using var session = await HeadlessBrowser.LaunchAsync(browser);
        await using var open = await session.OpenAsync(page);
        var census = await open.CensusAsync();
        output.WriteLine($"{Path.GetFileName(page)}: {census}");
        string shot = Path.ChangeExtension(page, ".png");
        await open.ScreenshotAsync(shot);
        output.WriteLine($"page: {page}\nscreenshot: {shot}");
        // As many charts as the views promised (a run report has over a dozen, a comparison five or more).
        Assert.Equal(expected, census.Expected);
        Assert.True(census.Expected >= 5, $"only {census.Expected} charts on {page}");
        Assert.Equal(census.Expected, census.Drawn);
        Assert.Equal(census.Expected, census.WithSvg);
        Assert.Empty(census.Errors);
        Assert.Empty(open.ConsoleErrors);

        var layouts = await open.LayoutAsync();
        Assert.Equal(census.Expected, layouts.Count);
        // The audit must have something to audit: every chart has tick labels (a layout read as empty would pass).
        Assert.All(layouts, l => Assert.True(l.Ticks.Count > 0, $"chart {l.Index} '{l.Name}': no tick labels read"));
        var problems = layouts.SelectMany(l => l.Problems()).ToArray();
        foreach (var p in problems) output.WriteLine(p);
        File.WriteAllLines(Path.ChangeExtension(page, ".problems.txt"), problems);
        Assert.True(problems.Length == 0, $"{problems.Length} layout problems on {Path.GetFileName(page)}:\n{string.Join("\n", problems.Take(40))}");
    }
}
