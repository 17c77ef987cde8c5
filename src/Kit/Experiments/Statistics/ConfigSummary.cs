using Kit.Diagnostics;

namespace Kit.Experiments;

/// <summary>A length bin pooled over a config's runs: counts add up, the Wilson interval is on the pooled counts.</summary>
public sealed record PooledLengthBin(string Bin, double Lo, double Hi, int Count, int Correct, double Accuracy, double WilsonLow, double WilsonHigh);

/// <summary>A reliability bin pooled over a config's runs (count-weighted confidence and accuracy).</summary>
public sealed record PooledReliabilityBin(double Lo, double Hi, int Count, double MeanConfidence, double Accuracy);

/// <summary>Mean training curve of a config: per epoch, the mean over runs that reached that epoch.</summary>
public sealed record CurvePoint(int Epoch, int Runs, double TrainLoss, double ValidationLoss, double ValidationAccuracy);

/// <summary>One config's figures over its runs (seeds × folds): spread of each metric, size, time, pooled diagnostics.</summary>
public sealed record ConfigSummary
{
    public required string Config { get; init; }
    /// <summary>The short name charts use (<see cref="ConfigLabels"/>); the full name until a comparison sets it.</summary>
    public string Label { get; init; } = "";
    /// <summary>The grid settings the config gives (empty for the baselines and the base config).</summary>
    public IReadOnlyDictionary<string, string> Settings { get; init; } = new Dictionary<string, string>();
    public required string Model { get; init; }
    public required bool Baseline { get; init; }
    public required int Runs { get; init; }
    /// <summary>Distinct training seeds and the folds per seed (1 for a holdout split).</summary>
    public int Seeds { get; init; } = 1;
    public int Folds { get; init; } = 1;
    public required SummaryStatistic Accuracy { get; init; }
    public required SummaryStatistic MacroF1 { get; init; }
    public required SummaryStatistic Ece { get; init; }
    public required SummaryStatistic LogLoss { get; init; }
    public required SummaryStatistic TrainSeconds { get; init; }
    public required long Parameters { get; init; }
    public required IReadOnlyList<CurvePoint> Curve { get; init; }
    public required IReadOnlyList<PooledLengthBin> ByLength { get; init; }
    public required IReadOnlyList<PooledReliabilityBin> Reliability { get; init; }

    public static ConfigSummary Of(IReadOnlyList<RunRecord> runs)
    {
        if (runs.Count == 0) throw new ArgumentException("a config summary needs at least one run");
        if (runs.Select(r => r.Config).Distinct().Count() != 1) throw new ArgumentException("runs of more than one config");
        var curve = runs.SelectMany(r => r.Epochs).GroupBy(e => e.Epoch).OrderBy(g => g.Key)
            .Select(g => new CurvePoint(g.Key, g.Count(), g.Average(e => e.TrainLoss), g.Average(e => e.ValidationLoss), g.Average(e => e.ValidationAccuracy)))
            .ToArray();
        var byLength = runs.SelectMany(r => r.ByLength).GroupBy(b => (b.Bin, b.Lo, b.Hi)).Select(g =>
        {
            int n = g.Sum(b => b.Count), hits = g.Sum(b => b.Correct);
            var (lo, hi) = Wilson.Interval(hits, n);
            return new PooledLengthBin(g.Key.Bin, g.Key.Lo, g.Key.Hi, n, hits, n == 0 ? double.NaN : (double)hits / n, lo, hi);
        }).OrderBy(b => b.Lo).ToArray();
        var reliability = runs.SelectMany(r => r.Reliability).GroupBy(b => (b.Lo, b.Hi)).Select(g =>
        {
            int n = g.Sum(b => b.Count);
            return new PooledReliabilityBin(g.Key.Lo, g.Key.Hi, n,
                n == 0 ? double.NaN : g.Where(b => b.Count > 0).Sum(b => b.Count * b.MeanConfidence) / n,
                n == 0 ? double.NaN : g.Where(b => b.Count > 0).Sum(b => b.Count * b.Accuracy) / n);
        }).OrderBy(b => b.Lo).ToArray();
        return new ConfigSummary
        {
            Config = runs[0].Config, Label = runs[0].Config, Settings = runs[0].Settings, Model = runs[0].Model, Baseline = runs[0].Baseline, Runs = runs.Count,
            Seeds = runs.Select(r => r.Seed).Distinct().Count(), Folds = runs.Max(r => r.Folds),
            Accuracy = SummaryStatistic.Of(runs.Select(r => r.Accuracy)),
            MacroF1 = SummaryStatistic.Of(runs.Select(r => r.MacroF1)),
            Ece = SummaryStatistic.Of(runs.Select(r => r.Ece)),
            LogLoss = SummaryStatistic.Of(runs.Select(r => r.LogLoss)),
            TrainSeconds = SummaryStatistic.Of(runs.Select(r => r.Timing?.TrainSeconds ?? double.NaN)),
            Parameters = (long)Math.Round(runs.Average(r => (double)r.Parameters)),
            Curve = curve, ByLength = byLength, Reliability = reliability,
        };
    }
}
