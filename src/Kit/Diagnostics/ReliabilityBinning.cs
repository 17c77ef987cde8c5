namespace Kit.Diagnostics;

/// <summary>
/// Bins (confidence, outcome) pairs and computes ECE = Σ_m (|B_m|/n)·|acc(B_m) − conf(B_m)| and
/// MCE = max_m |acc(B_m) − conf(B_m)| over non-empty bins (Guo et al. 2017, eqs. 3 and 5). The pairs are sorted
/// once; a bootstrap replicate is then just an integer weight per pair (how often it was drawn), which keeps
/// 1,000 replicates linear in n instead of re-sorting each one.
/// </summary>
internal sealed class ReliabilityBinning
{
    readonly double[] _confidence;   // ascending
    readonly bool[] _outcome;
    readonly int _bins;
    readonly BinningScheme _scheme;

    public ReliabilityBinning(double[] confidence, bool[] outcome, int bins, BinningScheme scheme)
    {
        var order = Enumerable.Range(0, confidence.Length).OrderBy(i => confidence[i]).ThenBy(i => i).ToArray();
        _confidence = order.Select(i => confidence[i]).ToArray();
        _outcome = order.Select(i => outcome[i]).ToArray();
        _bins = bins;
        _scheme = scheme;
    }

    public int Count => _confidence.Length;

    /// <summary>Bin index of each sorted pair given per-pair weights (null = each counted once).</summary>
    int[] Assign(int[]? weights)
    {
        var bin = new int[_confidence.Length];
        if (_scheme == BinningScheme.EqualWidth)
        {
            for (int i = 0; i < bin.Length; i++)
                // Right-closed bins ((m−1)/M, m/M]; a confidence of exactly 0 joins the first bin.
                bin[i] = Math.Clamp((int)Math.Ceiling(_confidence[i] * _bins) - 1, 0, _bins - 1);
            return bin;
        }
        long total = weights is null ? bin.Length : weights.Sum(w => (long)w), before = 0;
        for (int i = 0; i < bin.Length; i++)
        {
            bin[i] = (int)Math.Min(_bins - 1, before * _bins / total);
            before += weights is null ? 1 : weights[i];
        }
        return bin;
    }

    public ReliabilityBin[] Bins(int[]? weights = null)
    {
        var bin = Assign(weights);
        var count = new long[_bins];
        var sumConf = new double[_bins];
        var hits = new double[_bins];
        var lo = Enumerable.Repeat(double.PositiveInfinity, _bins).ToArray();
        var hi = Enumerable.Repeat(double.NegativeInfinity, _bins).ToArray();
        for (int i = 0; i < bin.Length; i++)
        {
            int w = weights is null ? 1 : weights[i];
            if (w == 0) continue;
            int b = bin[i];
            count[b] += w;
            sumConf[b] += w * _confidence[i];
            if (_outcome[i]) hits[b] += w;
            lo[b] = Math.Min(lo[b], _confidence[i]);
            hi[b] = Math.Max(hi[b], _confidence[i]);
        }
        var result = new ReliabilityBin[_bins];
        for (int b = 0; b < _bins; b++)
        {
            double l = _scheme == BinningScheme.EqualWidth ? (double)b / _bins : count[b] == 0 ? double.NaN : lo[b];
            double h = _scheme == BinningScheme.EqualWidth ? (double)(b + 1) / _bins : count[b] == 0 ? double.NaN : hi[b];
            result[b] = count[b] == 0
                ? new ReliabilityBin(l, h, 0, double.NaN, double.NaN)
                : new ReliabilityBin(l, h, checked((int)count[b]), sumConf[b] / count[b], hits[b] / count[b]);
        }
        return result;
    }

    public static (double Ece, double Mce) Errors(IReadOnlyList<ReliabilityBin> bins)
    {
        long n = bins.Sum(b => (long)b.Count);
        double ece = 0, mce = 0;
        foreach (var b in bins)
        {
            if (b.Count == 0) continue;
            double gap = Math.Abs(b.Accuracy - b.MeanConfidence);
            ece += (double)b.Count / n * gap;
            mce = Math.Max(mce, gap);
        }
        return (ece, mce);
    }
}
