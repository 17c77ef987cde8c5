using Kit.Common;
using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class TsneTests
{
    /// <summary>Isotropic Gaussian clusters (sd 1) around centres 12 apart on distinct axes: invented, well separated.</summary>
    internal static (double[][] X, int[] Cluster) Clusters(int clusters, int perCluster, int dims, ulong seed)
    {
        var rng = new SplitMix64(seed);
        var x = new double[clusters * perCluster][];
        var label = new int[x.Length];
        for (int i = 0; i < x.Length; i++)
        {
            label[i] = i % clusters;
            x[i] = new double[dims];
            for (int j = 0; j < dims; j++) x[i][j] = rng.NextGaussian() + (j == label[i] % dims ? 12 : 0);
        }
        return (x, label);
    }

    // The exact t-SNE gradient, van der Maaten and Hinton (2008), JMLR 9:2579, eq. 5, with P from our sparse
    // affinities: dC/dy_i = 4 Σ_j (α P_ij − q_ij) (1 + ‖y_i − y_j‖²)⁻¹ (y_i − y_j). With θ = 0 the Barnes–Hut
    // tree opens every cell, so it must agree to rounding; with θ = 0.5 to a few per cent.
    [Fact]
    public void Barnes_Hut_gradient_matches_the_exact_gradient()
    {
        var (x, _) = Clusters(3, 40, 5, seed: 2);
        var p = SparseAffinities.Compute(x, 10, new ParallelOptions());
        var rng = new SplitMix64(4);
        int n = x.Length;
        var y = Enumerable.Range(0, 2 * n).Select(_ => 3 * rng.NextGaussian()).ToArray();
        var dense = new double[n, n];
        for (int i = 0; i < n; i++)
            for (int e = p.RowStart[i]; e < p.RowStart[i + 1]; e++) dense[i, p.Column[e]] = p.Value[e];
        double z = 0;
        for (int i = 0; i < n; i++)
            for (int j = 0; j < n; j++)
                if (i != j) z += 1 / (1 + Sq(y, i, j));
        var exact = new double[2 * n];
        const double alpha = 12;
        for (int i = 0; i < n; i++)
            for (int j = 0; j < n; j++)
            {
                if (i == j) continue;
                double w = 1 / (1 + Sq(y, i, j));
                double f = 4 * (alpha * dense[i, j] - w / z) * w;
                exact[2 * i] += f * (y[2 * i] - y[2 * j]);
                exact[2 * i + 1] += f * (y[2 * i + 1] - y[2 * j + 1]);
            }

        var g = new double[2 * n];
        double zTree = Tsne.Gradient(p, y, alpha, 0, new QuadTree(), g, new double[2 * n], new double[n], new ParallelOptions());
        Assert.Equal(z, zTree, 9);
        for (int c = 0; c < g.Length; c++) Assert.Equal(exact[c], g[c], 10);

        Tsne.Gradient(p, y, alpha, 0.5, new QuadTree(), g, new double[2 * n], new double[n], new ParallelOptions());
        double err = Math.Sqrt(g.Zip(exact, (a, b) => (a - b) * (a - b)).Sum() / exact.Sum(v => v * v));
        Assert.InRange(err, 0, 0.05);
    }

    static double Sq(double[] y, int i, int j)
    {
        double dx = y[2 * i] - y[2 * j], dy = y[2 * i + 1] - y[2 * j + 1];
        return dx * dx + dy * dy;
    }

    // Perplexity is defined as 2^H with H in bits (van der Maaten and Hinton 2008, eq. 4), i.e. e^H in nats.
    [Fact]
    public void Conditional_distributions_have_the_requested_perplexity_and_P_is_symmetric()
    {
        var (x, _) = Clusters(4, 50, 8, seed: 3);
        var rng = new SplitMix64(1);
        var distances = Enumerable.Range(0, 90).Select(_ => 50 * rng.NextDouble()).Order().ToArray();
        var cond = SparseAffinities.Conditional(distances, 30);
        Assert.Equal(1, cond.Sum(), 12);
        double entropy = -cond.Where(v => v > 0).Sum(v => v * Math.Log(v));
        Assert.Equal(30, Math.Exp(entropy), 3);

        var p = SparseAffinities.Compute(x, 15, new ParallelOptions());
        Assert.Equal(1, p.Value.Sum(), 12);
        var lookup = new Dictionary<(int, int), double>();
        for (int i = 0; i < p.Count; i++)
            for (int e = p.RowStart[i]; e < p.RowStart[i + 1]; e++) lookup[(i, p.Column[e])] = p.Value[e];
        foreach (var ((i, j), v) in lookup) Assert.Equal(v, lookup[(j, i)], 15);
    }

    // Trustworthiness (Venna and Kaski 2001) above 0.95 and 10-NN preservation above 0.35 on clusters that are
    // far apart: thresholds are common practice, no source (a random layout scores about 0.5 and 0.03).
    [Fact]
    public void Separated_clusters_keep_their_neighbourhoods_and_stay_apart()
    {
        var (x, cluster) = Clusters(5, 80, 20, seed: 9);
        var progress = new List<TsneProgress>();
        var y = Tsne.Run(x, new TsneOptions { Perplexity = 20 }, new SyncProgress(progress));
        Assert.Equal(x.Length, y.Length);
        double trust = NeighbourPreservation.Trustworthiness(x, y, 10);
        double knn = NeighbourPreservation.KnnPreservation(x, y, 10);
        Assert.True(trust > 0.95, $"trustworthiness {trust}");
        Assert.True(knn > 0.35, $"10-NN preservation {knn}");
        // Every point's nearest layout neighbour is from its own cluster.
        for (int i = 0; i < y.Length; i++)
        {
            int nearest = Enumerable.Range(0, y.Length).Where(j => j != i)
                .MinBy(j => (y[i][0] - y[j][0]) * (y[i][0] - y[j][0]) + (y[i][1] - y[j][1]) * (y[i][1] - y[j][1]));
            Assert.Equal(cluster[i], cluster[nearest]);
        }
        Assert.Equal(20, progress.Count);
        Assert.Equal(1000, progress[^1].Iteration);
        Assert.True(progress[^1].KlDivergence < progress[5].KlDivergence);
        Assert.True(progress[4].Exaggerating && !progress[5].Exaggerating);
    }

    [Fact]
    public void Layout_depends_on_the_seed_only_not_on_thread_count()
    {
        var (x, _) = Clusters(3, 50, 6, seed: 5);
        var options = new TsneOptions { Perplexity = 10, Iterations = 300, Initialisation = TsneInitialisation.Random, Seed = 8 };
        var a = Tsne.Run(x, options);
        var b = Tsne.Run(x, options with { MaxDegreeOfParallelism = 1 });
        var c = Tsne.Run(x, options with { Seed = 9 });
        for (int i = 0; i < a.Length; i++) Assert.Equal(a[i], b[i]);
        Assert.NotEqual(a[0], c[0]);
    }

    [Fact]
    public void Too_few_points_for_the_perplexity_is_a_clear_error()
    {
        var (x, _) = Clusters(2, 20, 3, seed: 1);
        var e = Assert.Throws<ArgumentException>(() => Tsne.Run(x, new TsneOptions { Perplexity = 30 }));
        Assert.Contains("needs at least 91 points", e.Message);
        Assert.Contains("perplexity ≤ 13", e.Message);
        Assert.Throws<ArgumentOutOfRangeException>(() => Tsne.Run(x, new TsneOptions { Perplexity = 5, Theta = -1 }));
    }

    [Fact]
    public void Coincident_points_do_not_break_the_tree()
    {
        var x = Enumerable.Range(0, 60).Select(i => new[] { (double)(i % 3), 0.0, 1.0 }).ToArray();
        var y = Tsne.Run(x, new TsneOptions { Perplexity = 5, Iterations = 200 });
        Assert.All(y, p => Assert.True(double.IsFinite(p[0]) && double.IsFinite(p[1])));
    }

    /// <summary>Progress&lt;T&gt; posts to the thread pool; tests need the reports in order and complete.</summary>
    sealed class SyncProgress(List<TsneProgress> sink) : IProgress<TsneProgress>
    {
        public void Report(TsneProgress value) => sink.Add(value);
    }
}
