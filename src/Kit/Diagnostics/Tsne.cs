using Kit.Common;
using System.Diagnostics;

namespace Kit.Diagnostics;

/// <summary>
/// Barnes–Hut t-SNE (van der Maaten 2014, "Accelerating t-SNE using tree-based algorithms", JMLR 15:3221).
/// Sparse input affinities from exact nearest neighbours; the gradient
/// ∂C/∂y_i = 4 [ Σ_j P_ij q_ij (y_i − y_j) − Σ_j q_ij² (y_i − y_j) / Z ],  q_ij = 1/(1+‖y_i − y_j‖²), Z = Σ_{k≠l} q_kl,
/// has its attractive half summed over the sparse P and its repulsive half and Z estimated with a quadtree.
/// Updates use momentum and per-coordinate gains (Jacobs 1988), as in the reference implementation.
/// Every parallel loop writes per-point results that are then reduced in a fixed order, so the layout depends on
/// the seed only, not on thread timing.
/// </summary>
public static class Tsne
{
    public static double[][] Run(double[][] x, TsneOptions options, IProgress<TsneProgress>? progress = null)
    {
        InputChecks.FiniteMatrix(x, nameof(x));
        ArgumentNullException.ThrowIfNull(options);
        options.Validate(x.Length);
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = options.MaxDegreeOfParallelism ?? -1 };
        var clock = Stopwatch.StartNew();
        var p = SparseAffinities.Compute(x, options.Perplexity, parallel);
        var y = Initial(x, options);
        Optimise(p, y, options, parallel, progress, clock);
        return Enumerable.Range(0, x.Length).Select(i => new[] { y[2 * i], y[2 * i + 1] }).ToArray();
    }

    public static double[][] Run(float[][] x, TsneOptions options, IProgress<TsneProgress>? progress = null)
    {
        ArgumentNullException.ThrowIfNull(x);
        return Run(x.Select(r => r is null ? null! : Array.ConvertAll(r, v => (double)v)).ToArray(), options, progress);
    }

    static double[] Initial(double[][] x, TsneOptions options)
    {
        int n = x.Length;
        var y = new double[2 * n];
        if (options.Initialisation == TsneInitialisation.Pca && x[0].Length >= 2)
        {
            var coords = Pca.Of(x, 2).Project(x);
            double sd = Math.Sqrt(coords.Sum(c => c[0] * c[0]) / n);
            double scale = sd > 0 ? 1e-4 / sd : 1;
            for (int i = 0; i < n; i++) { y[2 * i] = coords[i][0] * scale; y[2 * i + 1] = coords[i][1] * scale; }
            return y;
        }
        var rng = new SplitMix64(options.Seed);
        for (int i = 0; i < y.Length; i++) y[i] = 1e-4 * rng.NextGaussian();
        return y;
    }

    static void Optimise(SparseAffinities p, double[] y, TsneOptions options, ParallelOptions parallel, IProgress<TsneProgress>? progress, Stopwatch clock)
    {
        int n = p.Count;
        double rate = options.LearningRateFor(n);
        var gradient = new double[2 * n];
        var update = new double[2 * n];
        var gains = Enumerable.Repeat(1.0, 2 * n).ToArray();
        var tree = new QuadTree();
        var repulsion = new double[2 * n];
        var z = new double[n];
        for (int iter = 0; iter < options.Iterations; iter++)
        {
            bool exaggerating = iter < options.ExaggerationIterations;
            double exaggeration = exaggerating ? options.EarlyExaggeration : 1;
            double momentum = iter < options.MomentumSwitchIteration ? options.InitialMomentum : options.FinalMomentum;
            double sumQ = Gradient(p, y, exaggeration, options.Theta, tree, gradient, repulsion, z, parallel);
            for (int c = 0; c < y.Length; c++)
            {
                // Gains grow while the gradient keeps pushing against the current step, shrink when they agree.
                gains[c] = Math.Sign(gradient[c]) != Math.Sign(update[c]) ? gains[c] + 0.2 : gains[c] * 0.8;
                if (gains[c] < 0.01) gains[c] = 0.01;
                update[c] = momentum * update[c] - rate * gains[c] * gradient[c];
                y[c] += update[c];
            }
            Recentre(y);
            bool report = options.ProgressEvery > 0 ? (iter + 1) % options.ProgressEvery == 0 || iter + 1 == options.Iterations : iter + 1 == options.Iterations;
            if (progress is not null && report)
                progress.Report(new TsneProgress(iter + 1, options.Iterations, KlDivergence(p, y, sumQ), exaggerating, clock.Elapsed));
        }
    }

    /// <summary>
    /// Fills <paramref name="gradient"/> (interleaved x, y) with the t-SNE gradient for P scaled by
    /// <paramref name="exaggeration"/> and returns the estimate of Z used. <paramref name="repulsion"/> and
    /// <paramref name="zPerPoint"/> are scratch buffers of 2N and N entries.
    /// </summary>
    internal static double Gradient(SparseAffinities p, double[] y, double exaggeration, double theta, QuadTree tree, double[] gradient,
        double[] repulsion, double[] zPerPoint, ParallelOptions parallel)
    {
        int n = p.Count;
        tree.Build(y);
        const int chunk = 64;
        Parallel.For(0, (n + chunk - 1) / chunk, parallel, QuadTree.NewStack, (block, _, stack) =>
        {
            int end = Math.Min(n, (block + 1) * chunk);
            for (int i = block * chunk; i < end; i++)
            {
                double yx = y[2 * i], yy = y[2 * i + 1];
                var (rx, ry, zi) = tree.Repulsion(yx, yy, theta, ref stack);
                repulsion[2 * i] = rx; repulsion[2 * i + 1] = ry;
                zPerPoint[i] = zi;
                double ax = 0, ay = 0;
                for (int e = p.RowStart[i]; e < p.RowStart[i + 1]; e++)
                {
                    int j = p.Column[e];
                    double dx = yx - y[2 * j], dy = yy - y[2 * j + 1];
                    double pq = p.Value[e] / (1 + dx * dx + dy * dy);
                    ax += pq * dx; ay += pq * dy;
                }
                gradient[2 * i] = ax; gradient[2 * i + 1] = ay;
            }
            return stack;
        }, _ => { });
        double z = 0;
        for (int i = 0; i < n; i++) z += zPerPoint[i];   // fixed order: the sum does not depend on thread timing
        for (int c = 0; c < gradient.Length; c++) gradient[c] = 4 * (exaggeration * gradient[c] - repulsion[c] / z);
        return z;
    }

    static void Recentre(double[] y)
    {
        int n = y.Length / 2;
        double mx = 0, my = 0;
        for (int i = 0; i < n; i++) { mx += y[2 * i]; my += y[2 * i + 1]; }
        mx /= n; my /= n;
        for (int i = 0; i < n; i++) { y[2 * i] -= mx; y[2 * i + 1] -= my; }
    }

    /// <summary>KL(P‖Q) = Σ P_ij ln(P_ij / (q_ij / Z)) over the non-zero P (Q's remaining mass adds nothing).</summary>
    internal static double KlDivergence(SparseAffinities p, double[] y, double z)
    {
        double kl = 0;
        for (int i = 0; i < p.Count; i++)
            for (int e = p.RowStart[i]; e < p.RowStart[i + 1]; e++)
            {
                double pij = p.Value[e];
                if (pij <= 0) continue;
                int j = p.Column[e];
                double dx = y[2 * i] - y[2 * j], dy = y[2 * i + 1] - y[2 * j + 1];
                double q = 1 / (1 + dx * dx + dy * dy) / z;
                kl += pij * Math.Log(pij / q);
            }
        return kl;
    }
}
