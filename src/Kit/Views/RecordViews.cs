using System.Globalization;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Experiments;
using Kit.Training;

namespace Kit.Views;

/// <summary>
/// The kit's own record → view pairs, registered in <see cref="ViewRegistry"/> before anyone asks it, so a
/// notebook cell (or any front end) that ends in a result record shows that record's view. A record whose view
/// needs a second record carries it (a temperature report carries its before/after calibration, a split summary
/// its class names).
/// </summary>
public static class RecordViews
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    internal static void RegisterAll()
    {
        // Data
        ViewRegistry.Register<PreparedData>(DataViews.Prepared);
        ViewRegistry.Register<PreparedFold>(DataViews.Fold);
        ViewRegistry.Register<DatasetProfile>(DataViews.Profile);
        ViewRegistry.Register<SplitSummary>(DataViews.Split);
        ViewRegistry.Register<Split>(s => DataViews.Split(s.Summary));
        ViewRegistry.Register<LeakageReport>(DataViews.Leakage);
        ViewRegistry.Register<VocabularyCoverage>(DataViews.Coverage);
        ViewRegistry.Register<TruncationReport>(t => TextView.Paragraph("Truncation", t.ToString()));
        // Training
        ViewRegistry.Register<TrainingHistory>(h => HistoryViews.Curves(h));
        // Diagnostics
        ViewRegistry.Register<ClassificationMetrics>(Metrics);
        ViewRegistry.Register<LengthBreakdown>(b => new StackView("Accuracy by length", new IView[] { LengthViews.Accuracy(b), LengthViews.ClassByBin(b.ByClass) }));
        ViewRegistry.Register<ClassByBinTable>(t => LengthViews.ClassByBin(t));
        ViewRegistry.Register<CalibrationReport>(c => new StackView("Calibration", [CalibrationViews.Reliability(c), .. ManyClassViews.Reliability(c)]));
        ViewRegistry.Register<TemperatureReport>(Temperature);
        ViewRegistry.Register<Projection>(p => p.Points.Any(x => x.Label is not null) ? ProjectionViews.Sequences(p) : ProjectionViews.Tokens(p));
        ViewRegistry.Register<ErrorAnalysis>(e => ErrorViews.Tables(e));
        ViewRegistry.Register<DriftReport>(DriftViews.View);
        // Runs and comparisons
        ViewRegistry.Register<OcclusionCase>(OcclusionViews.Case);
        ViewRegistry.Register<RunOutcome>(Outcome);
        ViewRegistry.Register<RunDiagnostics>(Diagnostics);
        ViewRegistry.Register<RunReport>(r => new StackView(r.Title, r.Sections.Select(s => (IView)s.AsView()).ToArray()));
        ViewRegistry.Register<ReportSection>(s => s.AsView());
        ViewRegistry.Register<ComparisonRecord>(c => new StackView("Comparison", ComparisonReport.Views(c)));
        ViewRegistry.Register<SearchRecord>(SearchViews.Rungs);
        ViewRegistry.Register<ComparisonVerdict>(v => TextView.Paragraph("Verdict", v.Sentence()));
    }

    /// <summary>Headline table, per-class scores and the confusion counts (with many classes, clustered, and the most confused pairs).</summary>
    public static StackView Metrics(ClassificationMetrics m) => new("Test scores", ManyClasses.Apply(m.ClassNames.Count)
        ? [MetricsViews.Summary(m), MetricsViews.PerClass(m), MetricsViews.Confusion(m, normalised: false), ManyClassViews.ConfusedPairs(m)]
        : [MetricsViews.Summary(m), MetricsViews.PerClass(m), MetricsViews.Confusion(m, normalised: false)]);

    static IView Temperature(TemperatureReport t) => t.Before is not null && t.After is not null
        ? CalibrationViews.Temperature(t)
        : new TextView("Temperature scaling", Html.Table(new[] { "measure", "before", "after" }, new[]
        {
            new[] { "validation NLL (nats)", Html.Num(t.ValidationNllBefore), Html.Num(t.ValidationNllAfter) },
            new[] { "test NLL (nats)", Html.Num(t.TestNllBefore), Html.Num(t.TestNllAfter) },
            new[] { "test ECE", Html.Pct(t.TestEceBefore), Html.Pct(t.TestEceAfter) },
        }, $"T = {Html.Num(t.Temperature, 2)}, fitted on validation"));

    /// <summary>A run in a few lines: what ran, how it scored, and the report sections to open next.</summary>
    public static TextView Outcome(RunOutcome run)
    {
        var m = run.TestMetrics;
        var f = run.Fold;
        var (low, high) = Wilson.Interval((int)Math.Round(m.Accuracy * m.Count), m.Count);
        string table = Html.Table(new[] { "item", "value" }, new[]
        {
            new[] { "data", $"{Path.GetFileName(run.Table.SourcePath)}: {run.Data.SplitDescription}" },
            new[] { "parts", $"train {f.Split.Train.Length.ToString("N0", Inv)} · validation {f.Split.Validation.Length.ToString("N0", Inv)} · test {f.Split.Test.Length.ToString("N0", Inv)}" },
            new[] { "model", $"{Kit.Models.ModelDescription.Of(run.Config)}; {run.Model.ParameterCount().ToString("N0", Inv)} parameters" },
            new[] { "training", $"{run.History.Epochs.Count} epochs, best epoch {run.History.BestEpoch}, {run.Elapsed.TotalSeconds.ToString("F1", Inv)} s" },
            new[] { "test accuracy", $"{Html.Pct(m.Accuracy)} (95 % Wilson interval {Html.Pct(low)}–{Html.Pct(high)}, {m.Count.ToString("N0", Inv)} rows)" },
            new[] { "test macro F1", Html.Num(m.MacroF1) },
        }, numericRight: false);
        string sections = "<p>Report sections: " + string.Join(" · ", RunReport.SectionNames.Select(n => $"<code>report.{Html.Escape(Capital(n))}</code>"))
            + " — after <code>var report = RunReport.Of(run);</code> (a cell ending in <code>report</code> shows them all).</p>";
        return new TextView("Run outcome", table + sections);
    }

    static StackView Diagnostics(RunDiagnostics d)
    {
        var views = new List<IView>
        {
            DataViews.Profile(d.Profile), DataViews.Split(d.Split), DataViews.Leakage(d.Leakage),
            new StackView("Accuracy by length", new IView[] { LengthViews.Accuracy(d.ByLength), LengthViews.ClassByBin(d.ByLength.ByClass) }),
            CalibrationViews.Reliability(d.Calibration),
        };
        views.AddRange(ManyClassViews.Reliability(d.Calibration));
        views.Add(CalibrationViews.Temperature(d.Temperature));
        if (d.Embedding is not null) views.Add(ProjectionViews.Tokens(d.Embedding));
        if (d.TestRepresentations is not null) views.Add(ProjectionViews.Sequences(d.TestRepresentations));
        views.Add(ErrorViews.Tables(d.Errors));
        views.AddRange(d.Occlusions.Select(OcclusionViews.Case));
        return new StackView("Run diagnostics", views);
    }

    static string Capital(string s) => char.ToUpperInvariant(s[0]) + s[1..];
}
