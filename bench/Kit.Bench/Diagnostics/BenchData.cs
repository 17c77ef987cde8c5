using Kit.Common;
using Kit.Diagnostics;

namespace Kit.Bench.Diagnostics;

/// <summary>Seeded Gaussian clusters in d dimensions (invented data: ten centres 8 apart, unit spread).</summary>
internal static class BenchData
{
    public static double[][] Clusters(int n, int d, ulong seed)
    {
        var rng = new SplitMix64(seed);
        var centres = Enumerable.Range(0, 10).Select(_ => Enumerable.Range(0, d).Select(_ => 8 * rng.NextDouble()).ToArray()).ToArray();
        return Enumerable.Range(0, n).Select(i => centres[i % 10].Select(c => c + rng.NextGaussian()).ToArray()).ToArray();
    }
}
