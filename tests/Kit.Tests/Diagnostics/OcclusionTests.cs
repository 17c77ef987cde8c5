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

    /// <summary>Softmax of the given logits (the textbook definition, e^z_k / Σ_j e^z_j, computed directly).</summary>
    static double[] Softmax(params double[] z)
    {
        double max = z.Max();
        var e = z.Select(v => Math.Exp(v - max)).ToArray();
        return e.Select(v => v / e.Sum()).ToArray();
    }

    [Fact]
    public void Log_odds_drop_is_the_hand_computed_fall_in_log_p_minus_log_of_one_minus_p()
    {
        // Three classes, logits (1.5 · #(token 7), 0, 1). By hand: for a softmax, log p0 − log(1 − p0) = z0 − log(e^0 + e^1)
        // = z0 − log(1 + e), so with tokens [7, 7, 3] the log-odds of class 0 are 3 − log(1 + e) = 1.686738…, hiding a 7
        // leaves 1.5 − log(1 + e), a drop of exactly 1.5; hiding the 3 drops nothing. In probability the same edit is
        // e³/(e³ + 1 + e) − e^1.5/(e^1.5 + 1 + e) = 0.843795 − 0.546549 = 0.297245 (to six places).
        double[][] Score(int[][] batch) => batch.Select(s => Softmax(1.5 * s.Count(t => t == 7), 0, 1)).ToArray();
        var r = Occlusion.Compute([7, 7, 3], Score, Unknown, targetClass: 0);
        Assert.Equal(3 - Math.Log(1 + Math.E), r.BaseLogOdds, 12);
        Assert.Equal(1.686738, r.BaseLogOdds, 6);
        Assert.Equal(1.5, r.Positions[0].LogOddsDrop, 12);
        Assert.Equal(1.5 - Math.Log(1 + Math.E), r.Positions[1].OccludedLogOdds, 12);
        Assert.Equal(0, r.Positions[2].LogOddsDrop, 12);
        Assert.Equal(0.297245, r.Positions[0].Drop, 6);
        Assert.Equal(Math.Exp(3) / (Math.Exp(3) + 1 + Math.E) - Math.Exp(1.5) / (Math.Exp(1.5) + 1 + Math.E), r.Positions[0].Drop, 12);
        Assert.Equal(7, r.ToDataFrame().Columns.Count);
    }

    [Fact]
    public void A_confident_row_shows_log_odds_drops_where_the_probability_drop_rounds_to_zero()
    {
        // p(class 0) = e^(10 + 0.2·#7) / (e^(10 + 0.2·#7) + 2) = 0.999926 with one 7: hiding it moves p by 1.6e-5 (prints as 0.000)
        // but the log-odds by exactly 0.2 (the logit change, the other two logits being fixed).
        double[][] Score(int[][] batch) => batch.Select(s => Softmax(10 + 0.2 * s.Count(t => t == 7), 0, 0)).ToArray();
        var r = Occlusion.Compute([4, 7, 5], Score, Unknown, targetClass: 0);
        Assert.Equal(0.999926, r.BaseProbability, 6);
        Assert.Equal(1.6e-5, r.Positions[1].Drop, 6);
        Assert.Equal("0.000", Kit.Views.Html.Num(r.Positions[1].Drop));
        Assert.Equal(0.2, r.Positions[1].LogOddsDrop, 9);
        Assert.Equal(0, r.Positions[0].LogOddsDrop, 12);

        // Closer to 1 still: logit 30 puts 1 − p at 1.9e-13, where 1 − p computed from p keeps about three digits. The
        // sum of the other classes keeps them all, so the drop is still the logit change.
        double[][] Sure(int[][] batch) => batch.Select(s => Softmax(30 + 0.2 * s.Count(t => t == 7), 0, 0)).ToArray();
        var sure = Occlusion.Compute([4, 7, 5], Sure, Unknown, targetClass: 0);
        Assert.Equal(0.2, sure.Positions[1].LogOddsDrop, 9);
        Assert.True(Math.Abs(sure.Positions[1].Drop) < 1e-12);
    }

    [Fact]
    public void Log_odds_are_clamped_away_from_zero_and_one()
    {
        // log(1) − log(1e-15) = 34.538776…, and the mirror image for p = 0.
        Assert.Equal(-Math.Log(1e-15), Occlusion.LogOdds([1.0, 0.0], 0), 9);
        Assert.Equal(Math.Log(1e-15), Occlusion.LogOdds([1.0, 0.0], 1), 9);
        Assert.Equal(Math.Log(0.25 / 0.75), Occlusion.LogOdds([0.25, 0.5, 0.25], 2), 12);
        Assert.Throws<ArgumentOutOfRangeException>(() => Occlusion.LogOdds([0.5, 0.5], 2));
    }
}
