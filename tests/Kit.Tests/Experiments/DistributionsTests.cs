using Kit.Experiments;
using MathNet.Numerics.Distributions;

namespace Kit.Tests.Experiments;

/// <summary>The kit's own distribution functions against MathNet.Numerics 5.0.0 (a general-purpose reference library).</summary>
public class DistributionsTests
{
    [Theory]
    [InlineData(0, 10, 0.5)]
    [InlineData(3, 10, 0.5)]
    [InlineData(7, 24, 0.5)]
    [InlineData(12, 24, 0.5)]
    [InlineData(40, 400, 0.5)]
    [InlineData(2, 9, 0.3)]
    public void Binomial_cdf_matches_MathNet(int k, int n, double p) =>
        // Reference: MathNet.Numerics 5.0.0, Binomial.CDF.
        Assert.Equal(Binomial.CDF(p, n, k), Distributions.BinomialCdf(k, n, p), 1e-12);

    [Theory]
    [InlineData(0.001)]
    [InlineData(0.5)]
    [InlineData(1.0)]
    [InlineData(2.9)]
    [InlineData(3.841458820694124)]
    [InlineData(16.8178)]
    [InlineData(60)]
    public void Chi_squared_one_df_tail_matches_MathNet(double x)
    {
        // Reference: MathNet.Numerics 5.0.0, ChiSquared.CDF(1, x); relative agreement, the tail gets tiny.
        double expected = 1 - ChiSquared.CDF(1, x);
        if (x >= 16) expected = MathNet.Numerics.SpecialFunctions.Erfc(Math.Sqrt(x / 2)); // 1 − CDF loses digits that far out
        Assert.Equal(expected, Distributions.ChiSquaredOneDfSurvival(x), Math.Max(1e-14, expected * 1e-9));
    }

    [Fact]
    public void Chi_squared_critical_value_gives_five_percent()
    {
        // 3.841458820694124 is the 95th percentile of chi-squared(1) (= 1.959963984540054²; from memory, and the
        // square of the normal quantile the Wilson code already uses).
        Assert.Equal(0.05, Distributions.ChiSquaredOneDfSurvival(1.959963984540054 * 1.959963984540054), 1e-12);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(4)]
    [InlineData(9)]
    [InlineData(30)]
    public void Student_t_cdf_and_quantile_match_MathNet(int df)
    {
        // Reference: MathNet.Numerics 5.0.0, StudentT(0, 1, df).
        foreach (var t in new[] { -3.1, -0.4, 0.0, 0.7, 2.2, 12.0 })
            Assert.Equal(StudentT.CDF(0, 1, df, t), Distributions.StudentTCdf(t, df), 1e-10);
        Assert.Equal(StudentT.InvCDF(0, 1, df, 0.975), Distributions.StudentTQuantile(0.975, df), 1e-8);
        Assert.Equal(StudentT.InvCDF(0, 1, df, 0.025), Distributions.StudentTQuantile(0.025, df), 1e-8);
    }

    [Fact]
    public void Textbook_t_quantiles()
    {
        // Two-sided 95 % critical values of t, df = 1, 2, 4 (12.706, 4.303, 2.776 in every printed t table; from memory).
        Assert.Equal(12.706, Distributions.StudentTQuantile(0.975, 1), 3);
        Assert.Equal(4.303, Distributions.StudentTQuantile(0.975, 2), 3);
        Assert.Equal(2.776, Distributions.StudentTQuantile(0.975, 4), 3);
    }
}
