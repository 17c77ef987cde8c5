using Kit.Experiments;
using MathNet.Numerics.Distributions;

namespace Kit.Tests.Experiments;

public class McNemarTests
{
    // Agresti, Categorical Data Analysis (1990), p. 350 (§10.1 in the 2nd ed., 2002): presidential approval of
    // 1600 people in two surveys a month apart: 794 approve both times, 150 approve then disapprove, 86
    // disapprove then approve, 570 disapprove both times. The uncorrected statistic z² = (150 − 86)² / 236 =
    // 17.36 with p = 3.10e-05 is confirmed by the Penn State STAT 504 course notes on this example (SAS and R
    // output) and by the example in R's stats::mcnemar.test documentation (which cites the same page).
    [Fact]
    public void Agresti_presidential_approval_uncorrected()
    {
        var r = McNemar.FromCounts(794, 150, 86, 570, McNemarMethod.ChiSquared);
        Assert.Equal(17.3559, r.Statistic, 4);
        Assert.Equal(3.099e-05, r.PValue, 8);
        Assert.Equal(1600, r.Count);
        Assert.Equal((150 - 86) / 1600.0, r.AccuracyDifference, 12);
    }

    [Fact]
    public void Agresti_presidential_approval_corrected_is_the_default_for_large_counts()
    {
        // Edwards' continuity correction: (|150 − 86| − 1)² / 236 = 3969 / 236, worked by hand.
        var r = McNemar.FromCounts(794, 150, 86, 570);
        Assert.Equal(McNemarMethod.ChiSquaredCorrected, r.Method);
        Assert.Equal(3969.0 / 236, r.Statistic, 10);
        // Reference tail: MathNet.Numerics 5.0.0, via erfc(√(x/2)) = P(χ²₁ ≥ x).
        Assert.Equal(MathNet.Numerics.SpecialFunctions.Erfc(Math.Sqrt(3969.0 / 236 / 2)), r.PValue, 12);
    }

    [Fact]
    public void Small_discordant_counts_use_the_exact_binomial_test()
    {
        // 1 vs 7 discordant: p = 2 · (C(8,0) + C(8,1)) / 2⁸ = 18 / 256, worked by hand.
        var r = McNemar.FromCounts(50, 1, 7, 3);
        Assert.Equal(McNemarMethod.ExactBinomial, r.Method);
        Assert.Equal(18.0 / 256, r.PValue, 14);
        // Symmetric in A and B.
        Assert.Equal(r.PValue, McNemar.FromCounts(50, 7, 1, 3).PValue, 14);
        // At the switch-over the exact test still runs (24 discordant), the chi-squared at 25.
        Assert.Equal(McNemarMethod.ExactBinomial, McNemar.FromCounts(0, 12, 12, 0).Method);
        Assert.Equal(McNemarMethod.ChiSquaredCorrected, McNemar.FromCounts(0, 12, 13, 0).Method);
        // Reference: MathNet.Numerics 5.0.0 Binomial.CDF for a larger exact case.
        Assert.Equal(2 * Binomial.CDF(0.5, 24, 5), McNemar.FromCounts(10, 5, 19, 10).PValue, 12);
    }

    [Fact]
    public void Equal_discordant_counts_give_p_one_and_no_discordance_is_not_an_error()
    {
        Assert.Equal(1.0, McNemar.FromCounts(10, 6, 6, 3).PValue, 12);
        var none = McNemar.FromCounts(10, 0, 0, 3);
        Assert.Equal(1.0, none.PValue);
        Assert.Equal(0, none.Statistic);
    }

    [Fact]
    public void Per_item_outcomes_are_counted_into_the_four_cells()
    {
        bool[] a = [true, true, false, false, true, false, true];
        bool[] b = [true, false, true, false, false, false, true];
        var r = McNemar.Test(a, b);
        Assert.Equal((2, 2, 1, 2), (r.BothRight, r.OnlyA, r.OnlyB, r.BothWrong));
        Assert.Throws<ArgumentException>(() => McNemar.Test(a, b[..3]));
        Assert.Throws<ArgumentOutOfRangeException>(() => McNemar.FromCounts(1, -1, 2, 3));
    }
}
