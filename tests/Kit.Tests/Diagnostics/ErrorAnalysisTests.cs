using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class ErrorAnalysisTests
{
    static readonly string[] Names = ["x", "y", "z"];

    [Fact]
    public void Lists_confident_mistakes_high_losses_and_confused_pairs_in_order()
    {
        int[] labels = [0, 0, 1, 1, 2, 0, 0];
        double[][] probs =
        [
            [0.9, 0.05, 0.05],   // right
            [0.1, 0.8, 0.1],     // x→y, confidence 0.8
            [0.6, 0.3, 0.1],     // y→x, 0.6
            [0.05, 0.05, 0.9],   // y→z, 0.9
            [0.2, 0.2, 0.6],     // right
            [0.3, 0.5, 0.2],     // x→y, 0.5
            [0.05, 0.7, 0.25],   // x→y, 0.7
        ];
        string[] texts = ["a", "b", "c", "d", "e", "f", "g"];
        var r = ErrorAnalysis.Compute(labels, probs, texts, Names, top: 3);

        Assert.Equal(5, r.Mistakes);
        Assert.Equal([3, 1, 6], r.SureMistakes.Select(e => e.Index).ToArray());
        Assert.Equal("z", r.SureMistakes[0].PredictedClass);
        Assert.Equal(0.9, r.SureMistakes[0].Confidence);
        // Loss = −ln p(true): d 0.05, g 0.05 (tie -> lower index first), b 0.1
        Assert.Equal([3, 6, 1], r.CostliestRows.Select(e => e.Index).ToArray());
        Assert.Equal(-Math.Log(0.05), r.CostliestRows[0].Loss, 12);

        var top = r.MixedUpPairs[0];
        Assert.Equal(("x", "y", 3), (top.TrueClass, top.PredictedClass, top.Count));
        Assert.Equal(0.75, top.ShareOfTrueClass, 12);
        Assert.Equal(["b", "g", "f"], top.Examples.Select(e => e.Text).ToArray());
        Assert.Equal(("y", "x"), (r.MixedUpPairs[1].TrueClass, r.MixedUpPairs[1].PredictedClass));

        Assert.Equal(3, r.ToDataFrame().Rows.Count);
        Assert.Equal("b | g | f", r.MixedUpPairsToDataFrame()["Examples"][0]);
        Assert.Equal(3, (int)r.CostliestRowsToDataFrame()["Index"][0]!);
    }

    [Fact]
    public void Mismatched_texts_are_rejected()
    {
        var e = Assert.Throws<ArgumentException>(() => ErrorAnalysis.Compute([0], [[1, 0, 0]], ["a", "b"], Names));
        Assert.Contains("texts has 2 entries but labels has 1", e.Message);
    }
}
