namespace Kit.Diagnostics;

/// <summary>
/// The symmetric input affinities P of t-SNE restricted to each point's ⌊3·perplexity⌋ nearest neighbours
/// (van der Maaten 2014, section 4.1), in compressed sparse rows. Each conditional distribution p(j|i) uses the
/// Gaussian precision found by bisection so that its Shannon entropy equals ln(perplexity); then
/// P_ij = (p(j|i) + p(i|j)) / 2N, so P sums to 1.
/// </summary>
internal sealed class SparseAffinities
{
    public required int[] RowStart { get; init; }
    public required int[] Column { get; init; }
    public required double[] Value { get; init; }
    public int Count => RowStart.Length - 1;

    public static SparseAffinities Compute(double[][] x, double perplexity, ParallelOptions parallel)
    {
        int n = x.Length, k = Math.Min(n - 1, (int)Math.Floor(3 * perplexity));
        var (neighbours, distances) = NearestNeighbours.Find(x, k, parallel);
        var conditional = new double[n][];
        Parallel.For(0, n, parallel, i => conditional[i] = Conditional(distances[i], perplexity));

        // Symmetrise: gather both directions of every edge, then merge duplicates row by row.
        var rows = new List<(int Col, double V)>[n];
        for (int i = 0; i < n; i++) rows[i] = new List<(int, double)>(2 * k);
        for (int i = 0; i < n; i++)
            for (int t = 0; t < k; t++)
            {
                int j = neighbours[i][t];
                double v = conditional[i][t] / (2.0 * n);
                rows[i].Add((j, v));
                rows[j].Add((i, v));
            }
        var rowStart = new int[n + 1];
        var columns = new List<int>(2 * n * k);
        var values = new List<double>(2 * n * k);
        for (int i = 0; i < n; i++)
        {
            rows[i].Sort((a, b) => a.Col.CompareTo(b.Col));
            for (int t = 0; t < rows[i].Count; t++)
            {
                var (c, v) = rows[i][t];
                if (columns.Count > rowStart[i] && columns[^1] == c) values[^1] += v;
                else { columns.Add(c); values.Add(v); }
            }
            rowStart[i + 1] = columns.Count;
        }
        return new SparseAffinities { RowStart = rowStart, Column = columns.ToArray(), Value = values.ToArray() };
    }

    /// <summary>p(j|i) over the given squared distances with entropy ln(perplexity), by bisection on the precision β.</summary>
    internal static double[] Conditional(double[] squaredDistances, double perplexity)
    {
        int k = squaredDistances.Length;
        var p = new double[k];
        double target = Math.Log(perplexity), beta = 1, lo = double.NegativeInfinity, hi = double.PositiveInfinity;
        // Distances are shifted by the nearest one; this cancels in the normalisation and keeps exp() from
        // underflowing for far-away clusters.
        double shift = squaredDistances[0];
        for (int iter = 0; iter < 200; iter++)
        {
            double sum = 0, weighted = 0;
            for (int t = 0; t < k; t++)
            {
                double d = squaredDistances[t] - shift;
                p[t] = Math.Exp(-beta * d);
                sum += p[t];
                weighted += d * p[t];
            }
            double entropy = Math.Log(sum) + beta * weighted / sum;
            for (int t = 0; t < k; t++) p[t] /= sum;
            double diff = entropy - target;
            if (Math.Abs(diff) < 1e-5) break;
            if (diff > 0) { lo = beta; beta = double.IsPositiveInfinity(hi) ? beta * 2 : (beta + hi) / 2; }
            else { hi = beta; beta = double.IsNegativeInfinity(lo) ? beta / 2 : (beta + lo) / 2; }
        }
        return p;
    }
}
