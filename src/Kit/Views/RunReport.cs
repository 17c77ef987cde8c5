using System.Globalization;
using Kit.Experiments;

namespace Kit.Views;

/// <summary>
/// The views that make up the report of one run, in reading order: setup, data, training, test-split scores,
/// length, calibration, representations, errors. Every diagnostic is on the test split; temperature is fitted
/// on validation.
/// </summary>
public static class RunReport
{
    /// <summary>Computes the diagnostics (budget from <c>run.Spec.Diagnostics</c>) and returns every view.</summary>
    public static IReadOnlyList<IView> Views(RunOutcome run, IProgress<string>? stages = null) =>
        Views(run, RunDiagnostics.Compute(run, run.Spec.Diagnostics, stages));

    public static IReadOnlyList<IView> Views(RunOutcome run, RunDiagnostics d)
    {
        var s = run.Spec;
        var inv = CultureInfo.InvariantCulture;
        string setup = Html.Table(new[] { "item", "value" }, new[]
        {
            new[] { "data", $"{Path.GetFileName(s.DataPath)} — {run.Rows.Length} rows used of {run.Table.Count}, {run.Labels.Count} classes" },
            new[] { "split", $"{(s.GroupAware && run.Table.Groups is not null ? "group-aware" : "stratified")} holdout {s.TrainFraction:0.##}/{s.ValidationFraction:0.##}/{s.TestFraction:0.##}: {run.Split.Train.Length}/{run.Split.Validation.Length}/{run.Split.Test.Length} rows (seed {s.SplitSeed})" },
            new[] { "tokens", $"{run.Tokenizer.Name}, vocabulary {run.Vocabulary.Count} ids from the training part only (pad = 0, unknown = 1), max length {s.MaxLength}" },
            new[] { "model", $"{Kit.Models.ModelDescription.Of(run.Config)}; {run.Model.ParameterCount().ToString("N0", inv)} parameters" },
            new[] { "training", $"{run.History.Epochs.Count} epochs, batch {s.Training.BatchSize}, Adam lr {s.Training.LearningRate.ToString(inv)}, seed {s.Training.Seed}; best epoch {run.History.BestEpoch}{(run.History.StopReason is null ? "" : "; " + run.History.StopReason)}" },
            new[] { "time", $"{run.Elapsed.TotalSeconds.ToString("F1", inv)} s to train and score, {d.Elapsed.TotalSeconds.ToString("F1", inv)} s for the diagnostics, on {Environment.ProcessorCount} cores" },
        }, numericRight: false);
        var views = new List<IView>
        {
            new TextView("Run setup", setup),
            DataViews.Profile(d.Profile),
            DataViews.Split(d.Split, run.Labels.Names),
            DataViews.Leakage(d.Leakage),
            DataViews.Encoding(d.Coverage, run.Truncation),
            HistoryViews.Curves(run.History),
            MetricsViews.Summary(run.TestMetrics),
            MetricsViews.PerClass(run.TestMetrics),
            MetricsViews.Confusion(run.TestMetrics, normalised: false),
            MetricsViews.Confusion(run.TestMetrics, normalised: true),
            LengthViews.Accuracy(d.ByLength),
            LengthViews.ClassByBin(d.ByLength.ByClass),
            CalibrationViews.Reliability(d.Calibration),
            CalibrationViews.Reliability(d.CalibrationEqualMass),
            CalibrationViews.PerClass(d.Calibration),
            CalibrationViews.Temperature(d.Temperature, d.Calibration, d.CalibrationAfterScaling),
        };
        if (d.Embedding is not null) views.Add(ProjectionViews.Tokens(d.Embedding));
        views.Add(d.TestRepresentations is not null
            ? ProjectionViews.Sequences(d.TestRepresentations)
            : TextView.Paragraph("Projection of pooled test representations",
                $"Not drawn: the test split has {run.Test.Count} rows and the budget allows {d.Options.ProjectionMaxPoints}; at least {RunDiagnostics.MinProjectedRows} are needed."));
        views.Add(ErrorViews.Tables(d.Errors));
        foreach (var c in d.Occlusions)
            views.Add(OcclusionViews.Tokens(c.Result, c.Pieces, c.TargetClass,
                $"Occlusion: why “{Truncate(c.Text, 40)}” was called {c.PredictedClass}", c.Unknown,
                $"Picked as {c.Why}. True class {c.TrueClass}, predicted {c.PredictedClass}. Each token was replaced in turn by the unknown token."));
        return views;
    }

    static string Truncate(string s, int n) => s.Length <= n ? s : s[..(n - 1)] + "…";
}
