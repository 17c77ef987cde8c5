using Kit.Diagnostics;
using Microsoft.ML;
using Microsoft.ML.Data;

namespace Kit.Tests.Diagnostics;

public class ClassificationMetricsTests
{
    const int K = 5;

    sealed class ScoredRow
    {
        public float Label { get; set; }
        [VectorType(K)] public float[] Score { get; set; } = [];
        [KeyType(K)] public uint PredictedLabel { get; set; }
    }

    // Reference: Microsoft.ML 5.0.1, MulticlassClassificationCatalog.Evaluate, on the same random predictions.
    // Probabilities are rounded to float first because ML.NET scores are float; both sides then see equal numbers.
    [Fact]
    public void Matches_MicrosoftML_multiclass_metrics()
    {
        var (labels, probs) = Samples.Random(3000, K, seed: 11, signal: 1.0);
        var floats = probs.Select(p => p.Select(v => (float)v).ToArray()).ToArray();
        var doubles = floats.Select(p => p.Select(v => (double)v).ToArray()).ToArray();
        var ours = ClassificationMetrics.Compute(labels, doubles, Samples.Classes(K));

        var ml = new MLContext(seed: 0);
        var rows = labels.Select((y, i) => new ScoredRow
        {
            Label = y,             // a float label is read as the class index 0..K-1
            Score = floats[i],
            PredictedLabel = (uint)ours.Predicted[i] + 1,   // keys are 1-based; 0 means missing
        }).ToList();
        var theirs = ml.MulticlassClassification.Evaluate(ml.Data.LoadFromEnumerable(rows), topKPredictionCount: 3);

        Assert.Equal(theirs.MicroAccuracy, ours.Accuracy, 12);
        Assert.Equal(theirs.MacroAccuracy, ours.BalancedAccuracy, 12);
        Assert.Equal(theirs.LogLoss, ours.LogLoss, 6);
        Assert.Equal(theirs.LogLossReduction, ours.LogLossGainOverPrior, 6);
        Assert.Equal(theirs.TopKAccuracy, ours.AccuracyWithinTop(3), 12);
        Assert.Equal(3, theirs.TopKAccuracyForAllK.Count);   // ML.NET reports k = 1..topKPredictionCount
        for (int k = 1; k <= 3; k++) Assert.Equal(theirs.TopKAccuracyForAllK[k - 1], ours.AccuracyWithinTop(k), 12);
        for (int t = 0; t < K; t++)
            for (int q = 0; q < K; q++)
                Assert.Equal(theirs.ConfusionMatrix.Counts[t][q], ours.Confusion[t, q]);
        Assert.InRange(ours.Accuracy, 0.4, 0.9); // the sample is neither trivial nor chance
    }

    // Worked example of scikit-learn's classification_report docstring (y_true = [0,1,2,2,2],
    // y_pred = [0,0,2,2,1]); figures from memory, each re-derivable by hand from the definitions.
    [Fact]
    public void Precision_recall_F1_match_the_worked_example()
    {
        int[] truth = [0, 1, 2, 2, 2], predicted = [0, 0, 2, 2, 1];
        var probs = predicted.Select(c => Samples.Peak(3, c, 0.8)).ToArray();
        var m = ClassificationMetrics.Compute(truth, probs, ["class 0", "class 1", "class 2"]);

        Assert.Equal([0.5, 0.0, 1.0], m.PerClass.Select(c => c.Precision).ToArray());
        Assert.Equal(1.0, m.PerClass[0].Recall);
        Assert.Equal(2.0 / 3, m.PerClass[2].Recall, 12);
        Assert.Equal(2.0 / 3, m.PerClass[0].F1, 12);
        Assert.Equal(0.8, m.PerClass[2].F1, 12);
        Assert.Equal([1, 1, 3], m.PerClass.Select(c => c.TrueRows).ToArray());
        Assert.Equal(0.6, m.Accuracy, 12);
        Assert.Equal(0.6, m.MicroF1, 12);
        Assert.Equal(0.50, m.MacroPrecision, 2);
        Assert.Equal(0.56, m.MacroRecall, 2);
        Assert.Equal(0.49, m.MacroF1, 2);
        Assert.Equal(0.70, m.WeightedPrecision, 2);
        Assert.Equal(0.60, m.WeightedRecall, 2);
        Assert.Equal(0.61, m.WeightedF1, 2);
        // Balanced accuracy = mean recall = (1 + 0 + 2/3) / 3.
        Assert.Equal(5.0 / 9, m.BalancedAccuracy, 12);
        Assert.Equal(new[,] { { 1, 0, 0 }, { 1, 0, 0 }, { 0, 1, 2 } }, m.Confusion);
        Assert.Equal(2.0 / 3, m.ConfusionNormalised[2, 2], 12);
        Assert.Equal(1.0 / 3, m.ConfusionNormalised[2, 1], 12);
    }

    // Brier (1950), Monthly Weather Review 78:1–3, multi-category score Σ_k (p_k − o_k)² averaged over forecasts;
    // values worked by hand below.
    [Fact]
    public void Brier_and_log_loss_follow_their_definitions()
    {
        double[][] probs = [[0.7, 0.2, 0.1], [0.1, 0.3, 0.6]];
        int[] labels = [0, 1];
        var m = ClassificationMetrics.Compute(labels, probs, Samples.Classes(3));
        // (0.3² + 0.2² + 0.1²) = 0.14 ; (0.1² + 0.7² + 0.6²) = 0.86 ; mean 0.5
        Assert.Equal(0.5, m.Brier, 12);
        Assert.Equal(-(Math.Log(0.7) + Math.Log(0.3)) / 2, m.LogLoss, 12);
        Assert.Equal(0.5, m.AccuracyWithinTop(1), 12);
        Assert.Equal(1.0, m.AccuracyWithinTop(2), 12);
        Assert.Throws<ArgumentOutOfRangeException>(() => m.AccuracyWithinTop(4));
    }

    [Fact]
    public void Zero_probability_on_the_truth_gives_a_finite_floored_loss()
    {
        var m = ClassificationMetrics.Compute([1], [[1.0, 0.0]], Samples.Classes(2));
        Assert.Equal(-Math.Log(ClassificationMetrics.LogLossFloor), m.LogLoss, 9);
    }

    [Fact]
    public void Bad_input_is_rejected_with_the_offending_index()
    {
        var names = Samples.Classes(2);
        var e = Assert.Throws<ArgumentException>(() => ClassificationMetrics.Compute([0, 1], [[0.5, 0.5]], names));
        Assert.Contains("probabilities has 1 entries but labels has 2", e.Message);
        e = Assert.Throws<ArgumentException>(() => ClassificationMetrics.Compute([0, 1], [[0.5, 0.5], [0.9, 0.3]], names));
        Assert.Contains("probabilities[1] sums to 1.2", e.Message);
        var r = Assert.Throws<ArgumentOutOfRangeException>(() => ClassificationMetrics.Compute([0, 2], [[0.5, 0.5], [0.5, 0.5]], names));
        Assert.Contains("labels[1] = 2", r.Message);
        e = Assert.Throws<ArgumentException>(() => ClassificationMetrics.Compute([], [], names));
        Assert.Contains("empty", e.Message);
        e = Assert.Throws<ArgumentException>(() => ClassificationMetrics.Compute([0], [[0.5, 0.25, 0.25]], names));
        Assert.Contains("has 3 entries but there are 2 classes", e.Message);
        e = Assert.Throws<ArgumentException>(() => ClassificationMetrics.Compute([0], [[double.NaN, 1]], names));
        Assert.Contains("probabilities[0][0]", e.Message);
        e = Assert.Throws<ArgumentException>(() => ClassificationMetrics.Compute([0], [[1, 0]], ["a", "a"]));
        Assert.Contains("appears twice", e.Message);
    }

    [Fact]
    public void Frames_carry_the_per_class_rows_and_the_confusion_matrix()
    {
        var (labels, probs) = Samples.Random(200, 4, seed: 3);
        var m = ClassificationMetrics.Compute(labels, probs, Samples.Classes(4));
        var frame = m.ToDataFrame();
        Assert.Equal(4, frame.Rows.Count);
        Assert.Equal(m.PerClass[2].F1, (double)frame["F1"][2]!);
        Assert.Equal(labels.Count(y => y == 1), (int)frame["TrueRows"][1]!);
        var confusion = m.ConfusionToDataFrame();
        Assert.Equal(m.Confusion[3, 1], (int)confusion["c1"][3]!);
        Assert.Equal(m.ConfusionNormalised[0, 2], (double)m.ConfusionToDataFrame(normalised: true)["c2"][0]!, 12);
        var summary = m.SummaryToDataFrame();
        Assert.Contains("AccuracyWithinTop2", summary["Metric"].Cast<string>());
    }
}
