using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Rows to read by hand: the mistakes the model was surest of, the costliest rows by loss (right or wrong), and
/// the class pairs mixed up most often with their most confident instances. Ties are broken by example index so
/// the lists repeat exactly.
/// </summary>
public sealed record ErrorAnalysis(IReadOnlyList<ErrorExample> SureMistakes, IReadOnlyList<ErrorExample> CostliestRows,
    IReadOnlyList<MixedUpPair> MixedUpPairs, int Mistakes, int Count)
{
    public static ErrorAnalysis Compute(int[] labels, double[][] probabilities, string[] texts, IReadOnlyList<string> classNames, int top = 20,
        int examplesPerPair = 5)
    {
        InputChecks.NotEmpty(labels, nameof(labels));
        ArgumentNullException.ThrowIfNull(probabilities);
        ArgumentNullException.ThrowIfNull(texts);
        InputChecks.ClassNames(classNames);
        InputChecks.SameLength(labels.Length, nameof(labels), probabilities.Length, nameof(probabilities));
        InputChecks.SameLength(labels.Length, nameof(labels), texts.Length, nameof(texts));
        if (top < 1) throw new ArgumentOutOfRangeException(nameof(top), $"top = {top} must be at least 1.");
        if (examplesPerPair < 0) throw new ArgumentOutOfRangeException(nameof(examplesPerPair), $"examplesPerPair = {examplesPerPair} must not be negative.");
        int k = classNames.Count;
        InputChecks.Labels(labels, k);
        InputChecks.Probabilities(probabilities, k);

        var all = new ErrorExample[labels.Length];
        var predictedOf = new int[labels.Length];
        for (int i = 0; i < labels.Length; i++)
        {
            int predicted = predictedOf[i] = InputChecks.ArgMax(probabilities[i]);
            double pTrue = probabilities[i][labels[i]];
            all[i] = new ErrorExample(i, texts[i] ?? "", classNames[labels[i]], classNames[predicted], probabilities[i][predicted], pTrue,
                -Math.Log(Math.Max(pTrue, ClassificationMetrics.LogLossFloor)));
        }
        var mistakes = all.Where(e => labels[e.Index] != predictedOf[e.Index]).OrderByDescending(e => e.Confidence).ThenBy(e => e.Index).ToArray();
        var highestLoss = all.OrderByDescending(e => e.Loss).ThenBy(e => e.Index).Take(top).ToArray();
        var support = new int[k];
        foreach (int y in labels) support[y]++;
        var pairs = mistakes
            .GroupBy(e => (True: labels[e.Index], Predicted: predictedOf[e.Index]))
            .OrderByDescending(g => g.Count()).ThenBy(g => g.Key.True).ThenBy(g => g.Key.Predicted)
            .Take(top)
            .Select(g => new MixedUpPair(classNames[g.Key.True], classNames[g.Key.Predicted], g.Count(), (double)g.Count() / support[g.Key.True],
                g.Take(examplesPerPair).ToArray()))   // a group keeps the confidence order of `mistakes`
            .ToArray();
        return new ErrorAnalysis(mistakes.Take(top).ToArray(), highestLoss, pairs, mistakes.Length, labels.Length);
    }

    /// <summary>The sure mistakes as a table.</summary>
    public DataFrame ToDataFrame() => ExamplesFrame(SureMistakes);

    public DataFrame CostliestRowsToDataFrame() => ExamplesFrame(CostliestRows);

    /// <summary>TrueClass, PredictedClass, Count, ShareOfTrueClass, Examples (texts joined by " | ").</summary>
    public DataFrame MixedUpPairsToDataFrame() => new(
        FrameColumns.Text("TrueClass", MixedUpPairs.Select(p => p.TrueClass)),
        FrameColumns.Text("PredictedClass", MixedUpPairs.Select(p => p.PredictedClass)),
        FrameColumns.Count("Count", MixedUpPairs.Select(p => p.Count)),
        FrameColumns.Number("ShareOfTrueClass", MixedUpPairs.Select(p => p.ShareOfTrueClass)),
        FrameColumns.Text("Examples", MixedUpPairs.Select(p => string.Join(" | ", p.Examples.Select(e => e.Text)))));

    static DataFrame ExamplesFrame(IReadOnlyList<ErrorExample> rows) => new(
        FrameColumns.Count("Index", rows.Select(r => r.Index)),
        FrameColumns.Text("Text", rows.Select(r => r.Text)),
        FrameColumns.Text("TrueClass", rows.Select(r => r.TrueClass)),
        FrameColumns.Text("PredictedClass", rows.Select(r => r.PredictedClass)),
        FrameColumns.Number("Confidence", rows.Select(r => r.Confidence)),
        FrameColumns.Number("TrueClassProbability", rows.Select(r => r.TrueClassProbability)),
        FrameColumns.Number("Loss", rows.Select(r => r.Loss)));
}
