namespace Kit.Diagnostics;

/// <summary>
/// How well a low-dimensional layout keeps each point's neighbourhood: trustworthiness (Venna and Kaski 2001,
/// "Neighborhood preservation in nonlinear projection methods: an experimental study") penalises points that
/// become near neighbours in the layout without being near in the input; kNN preservation is the mean share
/// of each point's k input-space neighbours that are also among its k layout neighbours.
/// </summary>
public static class NeighbourPreservation
{
    /// <summary>
    /// T(k) = 1 − 2 / (n k (2n − 3k − 1)) · Σ_i Σ_{j ∈ U_k(i)} (r(i, j) − k), where U_k(i) are the layout's k
    /// nearest neighbours of i that are not among its k nearest input neighbours and r(i, j) is j's rank by
    /// input distance (1 = nearest). Requires k &lt; n / 2 so the normalisation is positive. Time O(n² log n).
    /// </summary>
    public static double Trustworthiness(double[][] input, double[][] layout, int k)
    {
        int n = Check(input, layout, k);
        if (2 * n - 3 * k - 1 <= 0) throw new ArgumentOutOfRangeException(nameof(k), $"k = {k} is too large for {n} points (need 2n − 3k − 1 > 0).");
        double penalty = 0;
        var perPoint = new double[n];
        Parallel.For(0, n, i =>
        {
            var inputRank = RanksFrom(input, i);
            var layoutNearest = Nearest(layout, i, k);
            double sum = 0;
            foreach (int j in layoutNearest)
                if (inputRank[j] > k) sum += inputRank[j] - k;
            perPoint[i] = sum;
        });
        foreach (double v in perPoint) penalty += v;
        return 1 - 2.0 / (n * (double)k * (2 * n - 3 * k - 1)) * penalty;
    }

    /// <summary>Mean over points of |kNN_input(i) ∩ kNN_layout(i)| / k.</summary>
    public static double KnnPreservation(double[][] input, double[][] layout, int k)
    {
        int n = Check(input, layout, k);
        var perPoint = new double[n];
        Parallel.For(0, n, i =>
        {
            var a = new HashSet<int>(Nearest(input, i, k));
            perPoint[i] = Nearest(layout, i, k).Count(a.Contains) / (double)k;
        });
        return perPoint.Average();
    }

    static int Check(double[][] input, double[][] layout, int k)
    {
        InputChecks.FiniteMatrix(input, nameof(input));
        InputChecks.FiniteMatrix(layout, nameof(layout));
        InputChecks.SameLength(input.Length, nameof(input), layout.Length, nameof(layout));
        if (k < 1 || k >= input.Length) throw new ArgumentOutOfRangeException(nameof(k), $"k = {k} must lie in 1..{input.Length - 1}.");
        return input.Length;
    }

    /// <summary>Rank of every other point by distance from i (1 = nearest, ties broken by index; i itself 0).</summary>
    static int[] RanksFrom(double[][] x, int i)
    {
        var order = Order(x, i);
        var rank = new int[x.Length];
        for (int r = 0; r < order.Length; r++) rank[order[r]] = r + 1;
        return rank;
    }

    static int[] Nearest(double[][] x, int i, int k) => Order(x, i).Take(k).ToArray();

    static int[] Order(double[][] x, int i)
    {
        // Equal distances are ordered by index so results repeat exactly.
        return Enumerable.Range(0, x.Length).Where(j => j != i)
            .Select(j => (j, d: DenseKernels.SquaredDistance(x[i], x[j])))
            .OrderBy(p => p.d).ThenBy(p => p.j).Select(p => p.j).ToArray();
    }
}
