using Kit.Diagnostics;
using Kit.Training;
using MathNet.Numerics.Statistics;

namespace Kit.Tests.Onnx;

public sealed class DriftStatisticsTests
{
    [Fact]
    public void Psi_is_the_sum_of_share_differences_times_their_log_ratio()
    {
        // PSI = Σ (a − e)·ln(a/e) (formula from memory; it is the Jeffreys divergence J = KL(a‖e) + KL(e‖a)).
        // e = (¼, ¼, ½), a = (½, ¼, ¼): ¼·ln 2 + 0 + (−¼)·ln ½ = ½·ln 2.
        Assert.Equal(0.5 * Math.Log(2), DriftStatistics.Psi(new double[] { 25, 25, 50 }, new double[] { 2, 1, 1 }), 12);
        // Jeffreys divergence computed independently from its two Kullback–Leibler halves.
        double[] e = { 0.1, 0.2, 0.3, 0.4 }, a = { 0.25, 0.25, 0.25, 0.25 };
        double kl(double[] p, double[] q) => p.Zip(q, (x, y) => x * Math.Log(x / y)).Sum();
        Assert.Equal(kl(a, e) + kl(e, a), DriftStatistics.Psi(e, a), 12);
        Assert.Equal(0, DriftStatistics.Psi(new double[] { 3, 5, 2 }, new double[] { 30, 50, 20 }), 12);
    }

    [Fact]
    public void Ks_statistic_equals_the_largest_gap_of_the_empirical_cdfs()
    {
        // Reference: MathNet.Numerics 5.0.0 Statistics.EmpiricalCDF over the raw samples.
        var rng = new Random(11);
        var x = Enumerable.Range(0, 400).Select(_ => (double)rng.Next(0, 30)).ToArray();
        var y = Enumerable.Range(0, 250).Select(_ => (double)(rng.Next(0, 25) + rng.Next(0, 10))).ToArray();
        double expected = Enumerable.Range(0, 40).Max(v => Math.Abs(Statistics.EmpiricalCDF(x, v) - Statistics.EmpiricalCDF(y, v)));
        var hx = TrainingProfile.LengthHistogram(x.Select(v => (int)v), 40).Select(c => (double)c).ToArray();
        var hy = TrainingProfile.LengthHistogram(y.Select(v => (int)v), 40).Select(c => (double)c).ToArray();
        Assert.Equal(expected, DriftStatistics.KsStatistic(hx, hy), 12);
        Assert.True(expected > 0.05);
    }

    [Theory]
    // Kolmogorov distribution critical values: P(K > 1.358) = 0.05, P(K > 1.628) = 0.01, P(K > 1.224) = 0.10
    // (Smirnov 1948 table, as reprinted in Massey 1951, J. Am. Stat. Assoc. 46:68–78).
    [InlineData(1.358, 0.05)]
    [InlineData(1.628, 0.01)]
    [InlineData(1.224, 0.10)]
    public void Kolmogorov_tail_matches_the_published_critical_values(double lambda, double alpha) =>
        Assert.Equal(alpha, DriftStatistics.KolmogorovQ(lambda), 3);

    [Fact]
    public void Same_data_passes_and_shifted_data_is_flagged()
    {
        var rng = new Random(5);
        int[] Lengths(int n, int shift) => Enumerable.Range(0, n).Select(_ => 5 + rng.Next(0, 10) + shift).ToArray();
        double[] Conf(int n, double low) => Enumerable.Range(0, n).Select(_ => low + rng.NextDouble() * (1 - low)).ToArray();
        var trainLabels = Enumerable.Range(0, 900).Select(i => i % 3).ToArray();
        var validationP = Conf(600, 0.6).Select((c, i) => Row(c, i % 3)).ToArray();
        var profile = TrainingProfile.From(16, Lengths(600, 0), 6000, 60, new[] { "a", "b", "c" }, trainLabels, validationP);

        var same = DriftReport.Compute(profile, Lengths(500, 0), 5000, 52, Conf(500, 0.6), Enumerable.Range(0, 500).Select(i => i % 3).ToArray());
        Assert.Equal(DriftLevel.None, same.Worst);

        var shifted = DriftReport.Compute(profile, Lengths(500, 12), 5000, 600, Conf(500, 0.34), Enumerable.Repeat(1, 500).ToArray());
        Assert.All(shifted.Checks, c => Assert.NotEqual(DriftLevel.None, c.Level));
        Assert.Equal(DriftLevel.Major, shifted.Checks.Single(c => c.Aspect == "tokens per row" && c.Statistic == "PSI").Level);
        Assert.Contains("'b' 100.0 % of rows", shifted.Checks.Single(c => c.Aspect == "predicted class mix").Verdict);
        Assert.Equal(6, shifted.ToDataFrame().Rows.Count);
    }

    static double[] Row(double top, int best)
    {
        var p = new double[3];
        for (int k = 0; k < 3; k++) p[k] = k == best ? top : (1 - top) / 2;
        return p;
    }

    [Fact]
    public void A_profile_survives_json_and_a_bad_one_names_the_file()
    {
        var profile = TrainingProfile.From(8, new[] { 1, 3, 3, 40 }, 20, 2, new[] { "x", "y" }, new[] { 0, 1, 1 },
            new[] { new[] { 0.9, 0.1 }, new[] { 0.3, 0.7 } });
        var back = TrainingProfile.FromJson(profile.ToJson(), "p.json");
        Assert.Equal(profile.ToJson(), back.ToJson());
        Assert.Equal(1, back.LengthCounts[^1]);   // 40 ≥ cap 16 lands in the overflow bin
        Assert.Equal(0.1, back.UnknownRate, 12);
        var e = Assert.Throws<FormatException>(() => TrainingProfile.FromJson("{\"version\":1}", "p.json"));
        Assert.StartsWith("p.json: training profile is malformed", e.Message);
    }
}
