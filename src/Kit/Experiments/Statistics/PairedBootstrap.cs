using Kit.Common;
namespace Kit.Experiments;

/// <summary>
/// Percentile bootstrap interval of accuracy(A) − accuracy(B) on the same items (Efron and Tibshirani 1993,
/// ch. 13): each replicate draws items with replacement and keeps each item's pair of outcomes together, so the
/// interval reflects the pairing that makes two classifiers on one test set far from independent.
/// </summary>
public sealed record BootstrapInterval(double Difference, double Low, double High, int Replicates, ulong Seed);

public static class PairedBootstrap
{
    public static BootstrapInterval AccuracyDifference(IReadOnlyList<bool> correctA, IReadOnlyList<bool> correctB,
        int replicates = 2000, ulong seed = 1, double level = 0.95)
    {
        if (correctA.Count != correctB.Count)
            throw new ArgumentException($"{correctA.Count} items for A but {correctB.Count} for B; a paired bootstrap needs the same items.");
        if (correctA.Count == 0) throw new ArgumentException("no items to resample.");
        if (replicates < 1) throw new ArgumentOutOfRangeException(nameof(replicates), $"replicates = {replicates} must be positive.");
        if (!(level > 0 && level < 1)) throw new ArgumentOutOfRangeException(nameof(level), $"level = {level} must lie in (0, 1).");
        int n = correctA.Count;
        // Only the per-item difference (+1, 0, −1) matters, so resampling sums of it is enough.
        var diff = new int[n];
        for (int i = 0; i < n; i++) diff[i] = (correctA[i] ? 1 : 0) - (correctB[i] ? 1 : 0);
        double observed = diff.Sum() / (double)n;
        var rng = new SplitMix64(seed);
        var values = new double[replicates];
        for (int r = 0; r < replicates; r++)
        {
            long s = 0;
            for (int i = 0; i < n; i++) s += diff[rng.NextInt(n)];
            values[r] = s / (double)n;
        }
        Array.Sort(values);
        double tail = (1 - level) / 2;
        // Same type-7 quantile as the calibration report's ECE interval.
        return new BootstrapInterval(observed, Kit.Diagnostics.CalibrationReport.Quantile(values, tail),
            Kit.Diagnostics.CalibrationReport.Quantile(values, 1 - tail), replicates, seed);
    }
}
