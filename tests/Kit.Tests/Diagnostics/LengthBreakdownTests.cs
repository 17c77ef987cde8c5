using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class LengthBreakdownTests
{
    static readonly string[] Names = ["a", "b"];

    // Worked by hand: lengths 2,3,4 fall in [1,5), 5,9 in [5,10), 10,20 in [10,20].
    [Fact]
    public void Fixed_edges_count_score_and_interval_each_bin()
    {
        int[] labels = [0, 0, 1, 1, 0, 1, 0];
        int[] predicted = [0, 1, 1, 1, 0, 0, 0];
        int[] lengths = [2, 3, 4, 5, 9, 10, 20];
        var r = LengthBreakdown.Compute(labels, predicted, lengths, Names, LengthBins.Edges(1, 5, 10, 20));

        Assert.Equal(["[1, 5)", "[5, 10)", "[10, 20]"], r.Rows.Select(b => b.Bin).ToArray());
        Assert.Equal([3, 2, 2], r.Rows.Select(b => b.Count).ToArray());
        Assert.Equal([2, 2, 1], r.Rows.Select(b => b.Correct).ToArray());
        Assert.Equal(2.0 / 3, r.Rows[0].Accuracy, 12);
        var (wl, wh) = Wilson.Interval(2, 3);
        Assert.Equal(wl, r.Rows[0].WilsonLow, 12);
        Assert.Equal(wh, r.Rows[0].WilsonHigh, 12);
        // Bin [1,5): labels a,a,b predicted a,b,b. a: TP1 FN1 FP0 -> F1 2/3; b: TP1 FN0 FP1 -> 2/3.
        Assert.Equal(2.0 / 3, r.Rows[0].MacroF1, 12);
        // Bin [5,10): labels b,a predicted b,a -> both perfect.
        Assert.Equal(1.0, r.Rows[1].MacroF1, 12);
        // Bin [10,20]: labels b,a predicted a,a. a: TP1 FP1 -> 2/3; b: TP0 FN1 -> 0; macro 1/3.
        Assert.Equal(1.0 / 3, r.Rows[2].MacroF1, 12);
        Assert.Equal(20, r.Rows[2].Hi);

        // Class x bin: class a has examples at lengths 2,3 (1 right), 9 (right), 20 (right).
        Assert.Equal(2, r.ByClass.Count[0, 0]);
        Assert.Equal(0.5, r.ByClass.Recall(0, 0), 12);
        Assert.Equal(1.0, r.ByClass.Recall(0, 2), 12);
        Assert.Equal(0.0, r.ByClass.Recall(1, 2), 12);
        var wide = r.ByClass.ToDataFrame();
        Assert.Equal(2, wide.Rows.Count);
        Assert.Equal(0.5, (double)wide["Recall [1, 5)"][0]!);

        var frame = r.ToDataFrame();
        Assert.Equal(3, frame.Rows.Count);
        Assert.Equal(2, (int)frame["Count"][2]!);
    }

    [Fact]
    public void Quantile_bins_split_the_data_evenly_and_merge_repeated_edges()
    {
        var lengths = Enumerable.Range(1, 100).ToArray();
        var labels = lengths.Select(l => l % 2).ToArray();
        var r = LengthBreakdown.Compute(labels, labels, lengths, Names, LengthBins.Quantiles(4));
        Assert.Equal(4, r.Rows.Count);
        Assert.Equal(100, r.Rows.Sum(b => b.Count));
        Assert.All(r.Rows, b => Assert.InRange(b.Count, 24, 26));
        Assert.Equal(1, r.Rows[0].Lo);
        Assert.Equal(100, r.Rows[^1].Hi);

        int[] few = [3, 3, 3, 3, 3, 3, 8, 9];
        var merged = LengthBreakdown.Compute(new int[8], new int[8], few, Names, LengthBins.Quantiles(4));
        Assert.True(merged.Rows.Count < 4);
        Assert.Equal(8, merged.Rows.Sum(b => b.Count));
    }

    [Fact]
    public void Group_variant_scores_each_named_group()
    {
        int[] labels = [0, 1, 1, 0, 1];
        int[] predicted = [0, 1, 0, 0, 0];
        string[] groups = ["x", "y", "x", "y", "y"];
        var r = LengthBreakdown.ByGroup(labels, predicted, groups, Names);
        Assert.Equal(["x", "y"], r.Rows.Select(b => b.Bin).ToArray());
        Assert.Equal(0.5, r.Rows[0].Accuracy, 12);
        Assert.Equal(2.0 / 3, r.Rows[1].Accuracy, 12);
        Assert.True(double.IsNaN(r.Rows[0].Lo));
    }

    [Fact]
    public void Any_numeric_attribute_can_be_binned()
    {
        int[] labels = [0, 1, 0, 1];
        int[] predicted = [0, 1, 1, 1];
        double[] digitShare = [0.0, 0.25, 0.5, 1.0];
        var r = LengthBreakdown.ByValue(labels, predicted, digitShare, Names, LengthBins.Edges(0, 0.5, 1), "Digit share");
        Assert.Equal("Digit share", r.Attribute);
        Assert.Equal([2, 2], r.Rows.Select(b => b.Count).ToArray());
        Assert.Equal([1.0, 0.5], r.Rows.Select(b => b.Accuracy).ToArray());
        var e = Assert.Throws<ArgumentException>(() =>
            LengthBreakdown.ByValue(labels, predicted, [0, 0, double.NaN, 0], Names, LengthBins.Quantiles(2)));
        Assert.Contains("values[2]", e.Message);
    }

    [Fact]
    public void Values_outside_the_edges_are_an_error_not_dropped()
    {
        var e = Assert.Throws<ArgumentException>(() =>
            LengthBreakdown.Compute([0, 0], [0, 0], [3, 40], Names, LengthBins.Edges(1, 10, 20)));
        Assert.Contains("example 1 is 40", e.Message);
        Assert.Throws<ArgumentException>(() => LengthBins.Edges(5, 5, 10));
        Assert.Throws<ArgumentException>(() => LengthBreakdown.Compute([0, 0], [0], [3, 4], Names, LengthBins.Quantiles(2)));
        Assert.Throws<ArgumentOutOfRangeException>(() => LengthBreakdown.Compute([0, 2], [0, 0], [3, 4], Names, LengthBins.Quantiles(2)));
    }
}
