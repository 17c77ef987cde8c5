using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class WilsonTests
{
    // Newcombe (1998), "Two-sided confidence intervals for the single proportion: comparison of seven methods",
    // Statistics in Medicine 17:857–872, Table II, method 3 (score interval without continuity correction),
    // worked examples 81/263, 15/148, 0/20, 1/29. Values from memory, to the paper's four decimals.
    [Theory]
    [InlineData(81, 263, 0.2553, 0.3662)]
    [InlineData(15, 148, 0.0624, 0.1605)]
    [InlineData(0, 20, 0.0000, 0.1611)]
    [InlineData(1, 29, 0.0061, 0.1718)]
    public void Matches_Newcombe_1998_worked_examples(int successes, int n, double low, double high)
    {
        var (l, h) = Wilson.Interval(successes, n);
        Assert.Equal(low, l, 0.00006);
        Assert.Equal(high, h, 0.00006);
    }

    [Fact]
    public void Full_success_mirrors_no_success()
    {
        var (l0, h0) = Wilson.Interval(0, 20);
        var (l1, h1) = Wilson.Interval(20, 20);
        Assert.Equal(0, l0);
        Assert.Equal(1, h1);
        Assert.Equal(1 - h0, l1, 12);
        Assert.True(double.IsNaN(Wilson.Interval(0, 0).Low));
    }

    [Fact]
    public void A_wider_z_widens_the_interval()
    {
        var (l95, h95) = Wilson.Interval(30, 100);
        var (l99, h99) = Wilson.Interval(30, 100, z: 2.5758293035489004);
        Assert.True(l99 < l95 && h99 > h95);
    }

    [Fact]
    public void Impossible_counts_are_rejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => Wilson.Interval(5, 4));
        Assert.Throws<ArgumentOutOfRangeException>(() => Wilson.Interval(-1, 4));
        Assert.Throws<ArgumentOutOfRangeException>(() => Wilson.Interval(1, 4, z: 0));
    }
}
