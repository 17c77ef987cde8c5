namespace Kit.Diagnostics;

/// <summary>
/// How to cut a numeric attribute (sequence length, or any other) into bins. Bins are half-open [lo, hi) except
/// the last, which is closed, so the maximum lands in a bin. Values outside the edges are an error: dropping
/// them would make the per-bin counts disagree with the overall metrics without saying so.
/// </summary>
public sealed record LengthBins
{
    public IReadOnlyList<double>? FixedEdges { get; }
    public int QuantileCount { get; }

    LengthBins(IReadOnlyList<double>? edges, int quantiles) { FixedEdges = edges; QuantileCount = quantiles; }

    /// <summary>Bins between consecutive edges, e.g. Edges(1, 5, 10, 20, 64) gives [1,5) [5,10) [10,20) [20,64].</summary>
    public static LengthBins Edges(params double[] edges)
    {
        ArgumentNullException.ThrowIfNull(edges);
        if (edges.Length < 2) throw new ArgumentException($"{edges.Length} edge(s) given; at least two are needed for one bin.", nameof(edges));
        for (int i = 0; i < edges.Length; i++)
        {
            if (!double.IsFinite(edges[i])) throw new ArgumentException($"edges[{i}] = {edges[i]} is not finite.", nameof(edges));
            if (i > 0 && edges[i] <= edges[i - 1])
                throw new ArgumentException($"edges must increase strictly; edges[{i}] = {edges[i]} follows {edges[i - 1]}.", nameof(edges));
        }
        return new LengthBins(edges.ToArray(), 0);
    }

    /// <summary>
    /// Edges at the 0, 1/q, …, 1 sample quantiles of the data (linear interpolation between order statistics,
    /// Hyndman and Fan 1996 type 7). Repeated edges, common with integer lengths, are merged, so fewer than q
    /// bins may result.
    /// </summary>
    public static LengthBins Quantiles(int count)
    {
        if (count < 1) throw new ArgumentOutOfRangeException(nameof(count), $"count = {count}; at least one quantile bin is needed.");
        return new LengthBins(null, count);
    }

    /// <summary>The edges for these values (the fixed ones, or quantiles of <paramref name="values"/>).</summary>
    public double[] EdgesFor(IReadOnlyList<double> values)
    {
        if (FixedEdges is not null) return FixedEdges.ToArray();
        if (values.Count == 0) throw new ArgumentException("no values to take quantiles of.", nameof(values));
        var sorted = values.OrderBy(v => v).ToArray();
        var edges = new List<double>();
        for (int q = 0; q <= QuantileCount; q++)
        {
            double h = (sorted.Length - 1) * (double)q / QuantileCount;
            int lo = (int)Math.Floor(h);
            double e = lo + 1 < sorted.Length ? sorted[lo] + (h - lo) * (sorted[lo + 1] - sorted[lo]) : sorted[lo];
            if (edges.Count == 0 || e > edges[^1]) edges.Add(e);
        }
        if (edges.Count == 1) edges.Add(edges[0]); // every value equal: one closed bin [v, v]
        return edges.ToArray();
    }

    /// <summary>Bin of <paramref name="value"/> given <paramref name="edges"/>, or −1 when outside.</summary>
    internal static int Locate(double[] edges, double value)
    {
        int last = edges.Length - 2;
        if (value < edges[0] || value > edges[^1]) return -1;
        if (value >= edges[last]) return last;
        int i = Array.BinarySearch(edges, value);
        return i >= 0 ? i : ~i - 1;
    }

    public override string ToString() => FixedEdges is null ? $"{QuantileCount} quantile bins" : $"edges {string.Join(", ", FixedEdges)}";
}
