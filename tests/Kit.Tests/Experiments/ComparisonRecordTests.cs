using Kit.Experiments;
using Kit.Views;

namespace Kit.Tests.Experiments;

public class ComparisonRecordTests
{
    static RunRecord Run(string config, ulong seed, bool[] correct, bool baseline = false, long parameters = 100)
    {
        int n = correct.Length;
        var labels = Enumerable.Range(0, n).Select(i => i % 2).ToArray();
        var predicted = labels.Select((y, i) => correct[i] ? y : 1 - y).ToArray();
        double accuracy = correct.Count(c => c) / (double)n;
        return ResultsStoreTests.Record(config, seed, 1, accuracy, folds: 1) with
        {
            Baseline = baseline, Epochs = baseline ? [] : [new EpochPoint(1, 0.7, 0.6, 0.8, 0.55)], Parameters = parameters, TestRows = Enumerable.Range(0, n).ToArray(), TestLabels = labels, Predicted = predicted,
            ByLength = [new LengthPoint("[1, 4)", 1, 4, n / 2, correct.Take(n / 2).Count(c => c)), new LengthPoint("[4, 9]", 4, 9, n - n / 2, correct.Skip(n / 2).Count(c => c))],
        };
    }

    static bool[] Correct(int n, params int[] wrong) => Enumerable.Range(0, n).Select(i => !wrong.Contains(i)).ToArray();

    [Fact]
    public void Configs_are_summarised_ordered_and_paired_against_the_best()
    {
        RunRecord[] runs =
        [
            Run("cell=gru", 1, Correct(10, 0)), Run("cell=gru", 2, Correct(10, 0, 1)),  // 0.9 and 0.8
            Run("cell=rnn", 1, Correct(10, 0, 1, 2, 3)), Run("cell=rnn", 2, Correct(10, 0, 1, 2)), // 0.6 and 0.7
            Run("naive-bayes", 1, Correct(10, 5, 6, 7), baseline: true, parameters: 42), // 0.7, one seed
        ];
        var c = ComparisonRecord.Build(runs);
        Assert.Equal(["cell=gru", "naive-bayes", "cell=rnn"], c.Configs.Select(s => s.Config));
        var gru = c.Best;
        Assert.Equal(0.85, gru.Accuracy.Mean, 12);
        Assert.Equal(Math.Sqrt(0.005), gru.Accuracy.StandardDeviation, 12); // SD of {0.9, 0.8}
        // By-length counts pool over runs: first bin holds items 0..4 of both runs, 3 of 10 wrong.
        Assert.Equal((10, 7), (gru.ByLength[0].Count, gru.ByLength[0].Correct));
        // Paired with the best: rnn once per seed, the single-seed baseline against each of gru's seeds.
        Assert.Equal(4, c.PairedTests.Count);
        var vsRnnSeed1 = c.PairedTests.Single(p => p.B == "cell=rnn" && p.Seed == 1);
        var m = vsRnnSeed1.McNemar; // gru misses item 0, rnn misses 0..3
        Assert.Equal((6, 3, 0, 1), (m.BothRight, m.OnlyA, m.OnlyB, m.BothWrong));
        Assert.Equal(0.3, vsRnnSeed1.Bootstrap.Difference, 12);
        var vsNbSeed2 = c.PairedTests.Single(p => p.B == "naive-bayes" && p.Seed == 2);
        Assert.Equal((3, 2), (vsNbSeed2.McNemar.OnlyA, vsNbSeed2.McNemar.OnlyB)); // gru seed 2 misses 0,1; nb misses 5,6,7
        Assert.Equal(c.PairedTests.Count, c.PairedToDataFrame().Rows.Count);
        Assert.Equal(3, c.ToDataFrame().Rows.Count);
        Assert.Equal(3 * 2, c.ByLengthToDataFrame().Rows.Count);
        Assert.Equal(2, c.CurvesToDataFrame().Rows.Count); // one epoch for each neural config, none for the baseline
    }

    [Fact]
    public void Runs_on_different_test_items_are_not_paired_and_the_reason_is_noted()
    {
        var a = Run("cell=gru", 1, Correct(10, 0));
        var b = Run("cell=rnn", 1, Correct(10, 1)) with { TestRows = Enumerable.Range(100, 10).ToArray() };
        var c = ComparisonRecord.Build([a, b]);
        Assert.Empty(c.PairedTests);
        Assert.Contains("different test items", Assert.Single(c.Notes));
    }

    [Fact]
    public void Every_comparison_view_renders_with_one_trace_group_per_config()
    {
        var c = ComparisonRecord.Build([Run("cell=gru", 1, Correct(10, 0)), Run("naive-bayes", 1, Correct(10, 1, 2), baseline: true)]);
        Assert.Equal(2, ComparisonViews.AccuracyByConfig(c).Traces.Count);
        Assert.Equal(2, ComparisonViews.AccuracyVsSize(c).Traces.Count);
        Assert.Equal(2, ComparisonViews.AccuracyByLength(c).Traces.Count);
        Assert.Equal(2 * 2, ComparisonViews.CalibrationSideBySide(c).Traces.Count); // bars + diagonal per config
        Assert.Single(ComparisonViews.LearningCurves(c).Traces); // the baseline has no epochs
        Assert.Contains("exact binomial", ComparisonViews.Paired(c).ToHtml());
    }
}
