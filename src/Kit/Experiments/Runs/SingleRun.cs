using System.Diagnostics;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// Everything one run produced: the prepared data and the fold it trained on, the trained model, its history and
/// test-part results. Row bookkeeping stays with <see cref="Data"/>: encoded sets carry table rows, split parts
/// carry positions in <see cref="PreparedData.Rows"/>.
/// </summary>
public sealed class RunOutcome
{
    public required RunSpec Spec { get; init; }
    public required PreparedData Data { get; init; }
    public required PreparedFold Fold { get; init; }
    public required ClassifierConfig Config { get; init; }
    public required SequenceClassifier Model { get; init; }
    public required TrainingHistory History { get; init; }
    public required double[][] ValidationLogits { get; init; }
    public required double[][] TestLogits { get; init; }
    public required double[][] TestProbabilities { get; init; }
    public required ClassificationMetrics TestMetrics { get; init; }
    public required TimeSpan Elapsed { get; init; }

    public LabelledTable Table => Data.Table;
    /// <summary>Table rows in play; <see cref="Split"/> indexes positions in this array.</summary>
    public int[] Rows => Data.Rows;
    public Split Split => Fold.Split;
    public LabelMap Labels => Data.Labels;
    public ITokenizer Tokenizer => Data.Tokenizer;
    public Vocabulary Vocabulary => Fold.Vocabulary;
    public EncodedSet Validation => Fold.Validation;
    public EncodedSet Test => Fold.Test;
    public TruncationReport Truncation => Fold.Truncation;

    /// <summary>Text of each test row, in the test set's order.</summary>
    public string[] TestTexts() => Split.Test.Select(Data.Text).ToArray();

    /// <summary>Token length (before truncation) of each test row, in the test set's order.</summary>
    public int[] TestLengths() => Split.Test.Select(p => Data.Lengths[p]).ToArray();

    public override string ToString() => FormattableString.Invariant(
        $"{Spec.EncoderName} run on {Path.GetFileName(Table.SourcePath)}: test accuracy {TestMetrics.Accuracy:P1}, macro F1 {TestMetrics.MacroF1:F3} ({Test.Count} rows), best epoch {History.BestEpoch}");
}

/// <summary>
/// Prepare, then run a fold: the building block of the demo, <c>kit train</c> and notebooks. The data is prepared
/// by <see cref="PreparedData.Prepare(LabelledTable, PrepareOptions)"/> from the spec's data settings, so the split
/// <c>kit inspect</c> audits with the same settings is the one trained on.
/// </summary>
public static class SingleRun
{
    public static RunOutcome Execute(RunSpec spec, IProgress<TrainingProgress>? progress = null, CancellationToken cancel = default)
    {
        var clock = Stopwatch.StartNew();
        var table = TableReader.Read(spec.DataPath, spec.Columns);
        return FoldRun.Execute(spec, PreparedData.Prepare(table, spec.Preparation), 1, progress, cancel, clock);
    }

    public static RunOutcome Execute(RunSpec spec, LabelledTable table, IProgress<TrainingProgress>? progress = null,
        CancellationToken cancel = default)
    {
        var clock = Stopwatch.StartNew();
        return FoldRun.Execute(spec, PreparedData.Prepare(table, spec.Preparation), 1, progress, cancel, clock);
    }

    /// <summary>Trains on data prepared earlier (e.g. the data a notebook has already audited).</summary>
    public static RunOutcome Execute(RunSpec spec, PreparedData data, IProgress<TrainingProgress>? progress = null,
        CancellationToken cancel = default) =>
        FoldRun.Execute(spec, data, 1, progress, cancel);
}
