using System.Globalization;
using Kit.Experiments;

namespace Kit.Views;

/// <summary>The views that make up the report of one run, in reading order.</summary>
public static class RunReport
{
    public static IReadOnlyList<IView> Views(RunOutcome run)
    {
        var s = run.Spec;
        var inv = CultureInfo.InvariantCulture;
        string setup = Html.Table(new[] { "item", "value" }, new[]
        {
            new[] { "data", $"{Path.GetFileName(s.DataPath)} — {run.Rows.Length} rows used of {run.Table.Count}, {run.Labels.Count} classes" },
            new[] { "split", $"{(s.GroupAware && run.Table.Groups is not null ? "group-aware" : "stratified")} holdout {s.TrainFraction:0.##}/{s.ValidationFraction:0.##}/{s.TestFraction:0.##}: {run.Split.Train.Length}/{run.Split.Validation.Length}/{run.Split.Test.Length} rows (seed {s.SplitSeed})" },
            new[] { "tokens", $"{run.Tokenizer.Name}, vocabulary {run.Vocabulary.Count} ids from the training part only (pad = 0, unknown = 1), max length {s.MaxLength}" },
            new[] { "model", $"{s.Cell} embedding {s.EmbeddingSize}, hidden {s.HiddenSize}, layers {s.Layers}{(s.Bidirectional ? ", bidirectional" : "")}, pooling {s.Pooling}; {run.Model.ParameterCount().ToString("N0", inv)} parameters" },
            new[] { "training", $"{run.History.Epochs.Count} epochs, batch {s.Training.BatchSize}, Adam lr {s.Training.LearningRate.ToString(inv)}, seed {s.Training.Seed}; best epoch {run.History.BestEpoch}{(run.History.StopReason is null ? "" : "; " + run.History.StopReason)}" },
            new[] { "time", $"{run.Elapsed.TotalSeconds.ToString("F1", inv)} s on {Environment.ProcessorCount} cores" },
        }, numericRight: false);
        return new IView[]
        {
            new TextView("Run setup", setup),
            HistoryViews.Curves(run.History),
            MetricsViews.Summary(run.TestMetrics),
            MetricsViews.Confusion(run.TestMetrics, normalised: false),
            MetricsViews.Confusion(run.TestMetrics, normalised: true),
        };
    }
}
