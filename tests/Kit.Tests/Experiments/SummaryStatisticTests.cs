using Kit.Experiments;

namespace Kit.Tests.Experiments;

public class SummaryStatisticTests
{
    [Fact]
    public void Mean_sd_and_t_interval_by_hand()
    {
        // 0.80, 0.84, 0.82: mean 0.82, sample SD 0.02, half-width t(0.975, 2) · 0.02 / √3 with t = 4.302653
        // (the printed table's 4.303; from memory, checked against MathNet in DistributionsTests).
        var s = SummaryStatistic.Of([0.80, 0.84, 0.82]);
        Assert.Equal(3, s.Count);
        Assert.Equal(0.82, s.Mean, 12);
        Assert.Equal(0.02, s.StandardDeviation, 12);
        double half = 4.302652729911275 * 0.02 / Math.Sqrt(3);
        Assert.Equal(0.82 - half, s.Low, 9);
        Assert.Equal(0.82 + half, s.High, 9);
    }

    [Fact]
    public void One_run_has_no_spread_and_NaN_values_are_left_out()
    {
        var one = SummaryStatistic.Of([0.7]);
        Assert.Equal(0.7, one.Mean);
        Assert.True(double.IsNaN(one.StandardDeviation) && double.IsNaN(one.Low));
        Assert.Equal(2, SummaryStatistic.Of([0.5, double.NaN, 0.7]).Count);
        Assert.Equal(0, SummaryStatistic.Of([]).Count);
    }
}
