using System.Text.Json;
using System.Text.Json.Serialization;
using Kit.Diagnostics;
using Microsoft.Data.Analysis;

namespace Kit.Experiments;

/// <summary>One top-label reliability bin of a run (equal-width bins on confidence).</summary>
public sealed record ReliabilityPoint(double Lo, double Hi, int Count, double MeanConfidence, double Accuracy);

/// <summary>One length bin of a run; the bin edges are the sweep's, so runs of every config share them.</summary>
public sealed record LengthPoint(string Bin, double Lo, double Hi, int Count, int Correct);

/// <summary>One epoch of a neural run's training curve (wall time is in <see cref="RunTiming"/>, not here).</summary>
public sealed record EpochPoint(int Epoch, double TrainLoss, double TrainAccuracy, double ValidationLoss, double ValidationAccuracy);

/// <summary>How long a run took and with how many engine threads: everything that may differ between machines.</summary>
public sealed record RunTiming(double TrainSeconds, double TotalSeconds, int Threads);

/// <summary>
/// One finished run as the results store keeps it, one JSON line each: which run, its scores on the test part
/// (with calibration and by-length counts), its size, its training curve, and per-item predictions so any two
/// configs can be compared item by item later (McNemar, paired bootstrap) without re-running anything.
/// </summary>
public sealed record RunRecord
{
    public const int FormatVersion = 1;

    public int Version { get; init; } = FormatVersion;
    public required string Id { get; init; }
    public required string Config { get; init; }
    public required IReadOnlyDictionary<string, string> Settings { get; init; }
    public required bool Baseline { get; init; }
    public required string Model { get; init; }
    public required ulong Seed { get; init; }
    public required int Fold { get; init; }
    public required int Folds { get; init; }
    public string? Shard { get; init; }
    public required long Parameters { get; init; }
    public required double Accuracy { get; init; }
    public required double MacroF1 { get; init; }
    public required double BalancedAccuracy { get; init; }
    public required double LogLoss { get; init; }
    public required double Brier { get; init; }
    public required double Ece { get; init; }
    public required double Mce { get; init; }
    public required double ClasswiseEce { get; init; }
    public required IReadOnlyList<ReliabilityPoint> Reliability { get; init; }
    public required IReadOnlyList<LengthPoint> ByLength { get; init; }
    public required IReadOnlyList<EpochPoint> Epochs { get; init; }
    public required int BestEpoch { get; init; }
    public required IReadOnlyList<string> ClassNames { get; init; }
    /// <summary>Row of each test item in the sampled table, its true class id and the predicted class id.</summary>
    public required int[] TestRows { get; init; }
    public required int[] TestLabels { get; init; }
    public required int[] Predicted { get; init; }
    public RunTiming? Timing { get; init; }
    /// <summary>Accuracy on the validation part: what a search promotes by and picks its final model by (never the test part).</summary>
    public double? ValidationAccuracy { get; init; }
    /// <summary>The successive-halving rung (0 = first) of a search run; null for a grid sweep's runs and for baselines.</summary>
    public int? Rung { get; init; }

    public RunKey Key => new(Config, Seed, Fold, Folds);

    /// <summary>Per item: was the prediction right.</summary>
    public bool[] Correct() => TestLabels.Select((y, i) => Predicted[i] == y).ToArray();

    static readonly JsonSerializerOptions Json = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
        WriteIndented = false,
    };

    /// <summary>One line of JSON (no line breaks inside, so the store stays one record per line).</summary>
    public string ToJsonLine() => JsonSerializer.Serialize(this, Json);

    /// <summary>The record without what legitimately differs between machines (timings, which shard ran it).</summary>
    public string ResultsJson() => (this with { Timing = null, Shard = null }).ToJsonLine();

    public static RunRecord FromJson(string line) =>
        JsonSerializer.Deserialize<RunRecord>(line, Json) ?? throw new JsonException("the line holds null");

    /// <summary>One row per run with its headline figures.</summary>
    public static DataFrame ToDataFrame(IEnumerable<RunRecord> runs)
    {
        var r = runs.ToArray();
        return new DataFrame(
            new StringDataFrameColumn("config", r.Select(x => x.Config)),
            new UInt64DataFrameColumn("seed", r.Select(x => x.Seed)),
            new Int32DataFrameColumn("fold", r.Select(x => x.Fold)),
            new Int64DataFrameColumn("parameters", r.Select(x => x.Parameters)),
            new DoubleDataFrameColumn("accuracy", r.Select(x => x.Accuracy)),
            new DoubleDataFrameColumn("macro_f1", r.Select(x => x.MacroF1)),
            new DoubleDataFrameColumn("ece", r.Select(x => x.Ece)),
            new DoubleDataFrameColumn("log_loss", r.Select(x => x.LogLoss)),
            new DoubleDataFrameColumn("train_seconds", r.Select(x => x.Timing?.TrainSeconds ?? double.NaN)),
            new Int32DataFrameColumn("test_items", r.Select(x => x.TestRows.Length)));
    }

    internal static IReadOnlyList<ReliabilityPoint> ReliabilityOf(CalibrationReport c) =>
        c.Bins.Select(b => new ReliabilityPoint(b.Lo, b.Hi, b.Count, b.MeanConfidence, b.Accuracy)).ToArray();

    internal static IReadOnlyList<LengthPoint> LengthsOf(LengthBreakdown b) =>
        b.Rows.Select(r => new LengthPoint(r.Bin, r.Lo, r.Hi, r.Count, r.Correct)).ToArray();
}
