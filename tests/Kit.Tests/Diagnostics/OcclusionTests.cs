using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class OcclusionTests
{
    const int Unknown = 0;

    /// <summary>A stand-in model: p(class 1) = σ(2·#(token 7) − 1). Each 7 supports class 1; other tokens do nothing.</summary>
    static double[][] Score(int[][] batch) => batch.Select(s =>
    {
        double p = 1 / (1 + Math.Exp(-(2.0 * s.Count(t => t == 7) - 1)));
        return new[] { 1 - p, p };
    }).ToArray();

    static double Sigmoid(double v) => 1 / (1 + Math.Exp(-v));

    [Fact]
    public void Drop_is_the_fall_in_the_target_probability_when_a_token_is_hidden()
    {
        int[] tokens = [7, 3, 7, 5];
        var r = Occlusion.Compute(tokens, Score, Unknown, targetClass: 1, tokenTexts: ["s", "e", "v", "n"]);
        Assert.Equal(Sigmoid(3), r.BaseProbability, 12);
        Assert.Equal(Sigmoid(3) - Sigmoid(1), r.Positions[0].Drop, 12);
        Assert.Equal(0, r.Positions[1].Drop, 12);
        Assert.Equal(r.Positions[0].Drop, r.Positions[2].Drop, 12);
        Assert.Equal("v", r.Positions[2].TokenText);
        Assert.Equal(4, r.ToDataFrame().Rows.Count);

        var predicted = Occlusion.ComputeForPredicted(tokens, Score, Unknown);
        Assert.Equal(1, predicted.TargetClass);
        var other = Occlusion.Compute(tokens, Score, Unknown, targetClass: 0);
        Assert.Equal(-r.Positions[0].Drop, other.Positions[0].Drop, 12);
    }

    [Fact]
    public void One_batch_holds_the_original_and_every_occluded_variant()
    {
        var seen = new List<int[][]>();
        Occlusion.Compute([4, 5, 6], b => { seen.Add(b); return Score(b); }, Unknown, 1);
        var batch = Assert.Single(seen);
        Assert.Equal([4, 5, 6], batch[0]);
        Assert.Equal([4, Unknown, 6], batch[2]);
    }

    [Fact]
    public void A_scorer_that_breaks_its_contract_is_reported()
    {
        var e = Assert.Throws<InvalidOperationException>(() => Occlusion.Compute([1, 2], b => Score(b).Take(1).ToArray(), Unknown, 1));
        Assert.Contains("returned 1 rows for 3 sequences", e.Message);
        e = Assert.Throws<InvalidOperationException>(() => Occlusion.Compute([1, 2], b => b.Select(_ => new[] { 3.0, 1.0 }).ToArray(), Unknown, 1));
        Assert.Contains("not a probability table", e.Message);
        Assert.Throws<ArgumentOutOfRangeException>(() => Occlusion.Compute([1, 2], Score, Unknown, 2));
        Assert.Throws<ArgumentException>(() => Occlusion.Compute([], Score, Unknown, 1));
    }
}
