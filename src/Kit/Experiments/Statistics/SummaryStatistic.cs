namespace Kit.Experiments;

/// <summary>
/// Mean, sample standard deviation and a 95 % t interval of one metric over a config's runs (seeds × folds).
/// The t interval treats runs as independent draws, which k-fold runs are not quite (their training sets
/// overlap), so with folds it is a reading aid rather than a test; the paired tests are the test.
/// </summary>
public sealed record SummaryStatistic(int Count, double Mean, double StandardDeviation, double Low, double High)
{
    public static SummaryStatistic Of(IEnumerable<double> values)
    {
        var v = values.Where(x => !double.IsNaN(x)).ToArray();
        if (v.Length == 0) return new SummaryStatistic(0, double.NaN, double.NaN, double.NaN, double.NaN);
        double mean = v.Average();
        if (v.Length == 1) return new SummaryStatistic(1, mean, double.NaN, double.NaN, double.NaN);
        double sd = Math.Sqrt(v.Sum(x => (x - mean) * (x - mean)) / (v.Length - 1));
        double half = Distributions.StudentTQuantile(0.975, v.Length - 1) * sd / Math.Sqrt(v.Length);
        return new SummaryStatistic(v.Length, mean, sd, mean - half, mean + half);
    }
}
