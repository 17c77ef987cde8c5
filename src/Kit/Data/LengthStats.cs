using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>
/// Summary of sequence lengths. Quantiles interpolate linearly between order statistics (Hyndman and Fan 1996,
/// definition 7, the default of R's quantile and NumPy's percentile).
/// </summary>
public sealed record LengthStats(int Count, int Min, int Max, double Mean, double Median, double P90, double P99)
{
    public static readonly LengthStats Empty = new(0, 0, 0, double.NaN, double.NaN, double.NaN, double.NaN);

    public static LengthStats Of(IEnumerable<int> lengths)
    {
        var sorted = lengths.ToArray();
        if (sorted.Length == 0) return Empty;
        Array.Sort(sorted);
        return new LengthStats(sorted.Length, sorted[0], sorted[^1], sorted.Average(x => (double)x),
            Quantile(sorted, 0.5), Quantile(sorted, 0.9), Quantile(sorted, 0.99));
    }

    /// <summary>Hyndman–Fan type 7 quantile of already sorted values.</summary>
    public static double Quantile(IReadOnlyList<int> sorted, double q)
    {
        if (sorted.Count == 0) return double.NaN;
        double h = (sorted.Count - 1) * q;
        int lo = (int)Math.Floor(h);
        int hi = Math.Min(lo + 1, sorted.Count - 1);
        return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }

    public static DataFrame ToDataFrame(IReadOnlyList<string> names, IReadOnlyList<LengthStats> stats) => new(
        new StringDataFrameColumn("name", names),
        new Int32DataFrameColumn("count", stats.Select(s => s.Count)),
        new Int32DataFrameColumn("min", stats.Select(s => s.Min)),
        new Int32DataFrameColumn("max", stats.Select(s => s.Max)),
        new DoubleDataFrameColumn("mean", stats.Select(s => s.Mean)),
        new DoubleDataFrameColumn("median", stats.Select(s => s.Median)),
        new DoubleDataFrameColumn("p90", stats.Select(s => s.P90)),
        new DoubleDataFrameColumn("p99", stats.Select(s => s.P99)));
}
