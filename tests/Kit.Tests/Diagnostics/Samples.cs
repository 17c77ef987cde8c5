using Kit.Common;
using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

/// <summary>Seeded synthetic predictions for the diagnostics tests (invented data, not a reference).</summary>
internal static class Samples
{
    public static string[] Classes(int k) => Enumerable.Range(0, k).Select(c => $"c{c}").ToArray();

    /// <summary>Random softmax rows over k classes; the true class gets a boost so accuracy is well above chance.</summary>
    public static (int[] Labels, double[][] Probabilities) Random(int n, int k, ulong seed, double signal = 1.5)
    {
        var rng = new SplitMix64(seed);
        var labels = new int[n];
        var probabilities = new double[n][];
        for (int i = 0; i < n; i++)
        {
            labels[i] = rng.NextInt(k);
            var z = new double[k];
            for (int c = 0; c < k; c++) z[c] = rng.NextGaussian() + (c == labels[i] ? signal : 0);
            probabilities[i] = TemperatureScaling.Softmax(z, 1);
        }
        return (labels, probabilities);
    }

    /// <summary>A probability row that puts <paramref name="top"/> on class <paramref name="c"/> and spreads the rest evenly.</summary>
    public static double[] Peak(int k, int c, double top)
    {
        var p = Enumerable.Repeat((1 - top) / (k - 1), k).ToArray();
        p[c] = top;
        return p;
    }
}
