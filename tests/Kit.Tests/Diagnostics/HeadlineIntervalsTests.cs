using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class HeadlineIntervalsTests
{
    [Fact]
    public void Accuracy_gets_the_wilson_interval_and_macro_f1_a_seeded_bootstrap_around_its_value()
    {
        var (labels, probs) = Samples.Random(1500, 4, seed: 21, signal: 1.0);
        var m = ClassificationMetrics.Compute(labels, probs, Samples.Classes(4));
        var i = HeadlineIntervals.Of(m, replicates: 400, seed: 9);

        int correct = labels.Where((y, r) => m.Predicted[r] == y).Count();
        Assert.Equal(Wilson.Interval(correct, labels.Length), (i.AccuracyLow, i.AccuracyHigh));
        Assert.Equal(m.Accuracy, i.Accuracy);
        Assert.Equal(m.MacroF1, i.MacroF1);
        Assert.InRange(m.MacroF1, i.MacroF1Low, i.MacroF1High);
        Assert.True(i.MacroF1High - i.MacroF1Low > 0.005, "a bootstrap over 1,500 rows cannot be this narrow");

        Assert.Equal(i, HeadlineIntervals.Of(m, replicates: 400, seed: 9));
        Assert.NotEqual(i.MacroF1Low, HeadlineIntervals.Of(m, replicates: 400, seed: 10).MacroF1Low);
        Assert.Throws<ArgumentOutOfRangeException>(() => HeadlineIntervals.Of(m, replicates: 0));
    }

    [Fact]
    public void The_resampled_macro_f1_is_computed_as_the_metrics_compute_it()
    {
        for (int seed = 1; seed <= 5; seed++)
        {
            var (labels, probs) = Samples.Random(300, 5, seed: (ulong)seed, signal: 0.6);
            var m = ClassificationMetrics.Compute(labels, probs, Samples.Classes(5));
            int k = 5;
            var hits = new int[k];
            var trueRows = new int[k];
            var predictedRows = new int[k];
            for (int r = 0; r < labels.Length; r++)
            {
                trueRows[labels[r]]++;
                predictedRows[m.Predicted[r]]++;
                if (labels[r] == m.Predicted[r]) hits[labels[r]]++;
            }
            Assert.Equal(m.MacroF1, HeadlineIntervals.MacroF1Of(hits, trueRows, predictedRows), 12);
        }
    }

    [Fact]
    public void Four_times_the_rows_roughly_halves_the_macro_f1_interval()
    {
        // Sampling error shrinks as 1/sqrt(n) (standard asymptotics; the 0.4-0.6 band is common practice, no source).
        var (labels, probs) = Samples.Random(800, 3, seed: 4, signal: 0.8);
        var names = Samples.Classes(3);
        var small = HeadlineIntervals.Of(ClassificationMetrics.Compute(labels, probs, names), 1000, 2);
        var bigLabels = Enumerable.Repeat(labels, 4).SelectMany(x => x).ToArray();
        var bigProbs = Enumerable.Repeat(probs, 4).SelectMany(x => x).ToArray();
        var big = HeadlineIntervals.Of(ClassificationMetrics.Compute(bigLabels, bigProbs, names), 1000, 2);
        double ratio = (big.MacroF1High - big.MacroF1Low) / (small.MacroF1High - small.MacroF1Low);
        Assert.InRange(ratio, 0.4, 0.6);
        Assert.Equal(small.MacroF1, big.MacroF1, 12);
    }
}
