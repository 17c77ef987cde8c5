using Kit.Common;
using System.Diagnostics;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>Everything one run produced: the split, the trained model, its history and test-split results.</summary>
public sealed class RunOutcome
{
    public required RunSpec Spec { get; init; }
    public required LabelledTable Table { get; init; }
    public required int[] Rows { get; init; }
    public required Split Split { get; init; }
    public required LabelMap Labels { get; init; }
    public required ITokenizer Tokenizer { get; init; }
    public required Vocabulary Vocabulary { get; init; }
    public required ClassifierConfig Config { get; init; }
    public required SequenceClassifier Model { get; init; }
    public required TrainingHistory History { get; init; }
    public required EncodedSet Validation { get; init; }
    public required EncodedSet Test { get; init; }
    public required double[][] ValidationLogits { get; init; }
    public required double[][] TestLogits { get; init; }
    public required double[][] TestProbabilities { get; init; }
    public required ClassificationMetrics TestMetrics { get; init; }
    public required TruncationReport Truncation { get; init; }
    public required TimeSpan Elapsed { get; init; }

    /// <summary>Text of each test row, in the test set's order.</summary>
    public string[] TestTexts() => Test.SourceRows.Select(r => Table.Texts[r]).ToArray();
}

/// <summary>
/// Data → tokens → leakage-aware split → vocabulary from the training part only → model → training →
/// test-split predictions. The building block of the demo, `kit train` and every sweep cell.
/// </summary>
public static class SingleRun
{
    public static RunOutcome Execute(RunSpec spec, IProgress<TrainingProgress>? progress = null, CancellationToken cancel = default)
    {
        var clock = Stopwatch.StartNew();
        var table = TableReader.Read(spec.DataPath, spec.Columns);
        return Execute(spec, table, progress, cancel, clock);
    }

    public static RunOutcome Execute(RunSpec spec, LabelledTable table, IProgress<TrainingProgress>? progress = null,
        CancellationToken cancel = default, Stopwatch? clock = null)
    {
        clock ??= Stopwatch.StartNew();
        var labels = new LabelMap(table.Labels);
        int[] rows = spec.SampleRows is int n && n < table.Count
            ? StratifiedSample(table.Labels.Select(l => labels[l]).ToArray(), n, spec.SplitSeed)
            : Enumerable.Range(0, table.Count).ToArray();
        int[] y = rows.Select(r => labels[table.Labels[r]]).ToArray();
        Split split = spec.GroupAware && table.Groups is not null
            ? Splitter.GroupHoldout(y, rows.Select(r => table.Groups[r]).ToArray(), spec.TrainFraction, spec.ValidationFraction, spec.TestFraction, spec.SplitSeed)
            : Splitter.StratifiedHoldout(y, spec.TrainFraction, spec.ValidationFraction, spec.TestFraction, spec.SplitSeed);

        return FoldRun.Execute(spec, table, rows, split, progress, cancel, clock);
    }

    /// <summary>A class-stratified, seeded sample of about <paramref name="n"/> row indices (every class keeps ≥ 1).</summary>
    internal static int[] StratifiedSample(int[] labels, int n, ulong seed)
    {
        double fraction = n / (double)labels.Length;
        var rng = new SplitMix64(seed);
        var picked = new List<int>();
        foreach (var cls in labels.Distinct().OrderBy(c => c))
        {
            var members = Enumerable.Range(0, labels.Length).Where(i => labels[i] == cls).ToArray();
            rng.Shuffle(members.AsSpan());
            int take = Math.Max(1, (int)Math.Round(members.Length * fraction));
            picked.AddRange(members.Take(take));
        }
        picked.Sort();
        return picked.ToArray();
    }
}
