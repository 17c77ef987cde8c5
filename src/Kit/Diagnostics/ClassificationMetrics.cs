using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Multiclass scores from true labels and predicted probabilities. The predicted class is the arg-max (ties to
/// the lowest index). Precision of a class never predicted, and F1 where precision and recall are both zero, are
/// 0, as scikit-learn does with zero_division=0. Macro and weighted averages run over the classes that occur as
/// a true or a predicted label, so a class absent from this split does not drag the average to zero; balanced
/// accuracy averages recall over classes with at least one true row.
/// </summary>
public sealed record ClassificationMetrics
{
    /// <summary>Probabilities below this are clipped before the log, the same floor Microsoft.ML uses, so one
    /// confident mistake gives a large but finite log loss.</summary>
    public const double LogLossFloor = 1e-15;

    public required IReadOnlyList<string> ClassNames { get; init; }
    public required int Count { get; init; }
    public required double Accuracy { get; init; }
    public required double BalancedAccuracy { get; init; }
    public required double MicroPrecision { get; init; }
    public required double MicroRecall { get; init; }
    public required double MicroF1 { get; init; }
    public required double MacroPrecision { get; init; }
    public required double MacroRecall { get; init; }
    public required double MacroF1 { get; init; }
    public required double WeightedPrecision { get; init; }
    public required double WeightedRecall { get; init; }
    public required double WeightedF1 { get; init; }
    /// <summary>Mean natural-log loss of the true class.</summary>
    public required double LogLoss { get; init; }
    /// <summary>1 − LogLoss / (log loss of always predicting the label frequencies of this set).</summary>
    public required double LogLossGainOverPrior { get; init; }
    /// <summary>Multiclass Brier score (Brier 1950): mean over examples of Σ_k (p_k − 1[y = k])², in [0, 2].</summary>
    public required double Brier { get; init; }
    /// <summary>Share of examples whose true class is among the k most probable, keyed by k = 1..classes.</summary>
    public required IReadOnlyDictionary<int, double> WithinTop { get; init; }
    public required IReadOnlyList<ClassScores> PerClass { get; init; }
    /// <summary>Counts; row = true class, column = predicted class.</summary>
    public required int[,] Confusion { get; init; }
    /// <summary>Each row of <see cref="Confusion"/> divided by its sum (a row with no examples is all zeros).</summary>
    public required double[,] ConfusionNormalised { get; init; }
    public required int[] Predicted { get; init; }

    /// <summary>Share of examples whose true class is among the <paramref name="k"/> most probable.</summary>
    public double AccuracyWithinTop(int k)
    {
        if (!WithinTop.TryGetValue(k, out double v))
            throw new ArgumentOutOfRangeException(nameof(k), $"k = {k}; accuracy within the top k exists for k = 1..{ClassNames.Count}.");
        return v;
    }

    public static ClassificationMetrics Compute(int[] labels, double[][] probabilities, IReadOnlyList<string> classNames)
    {
        InputChecks.NotEmpty(labels, nameof(labels));
        ArgumentNullException.ThrowIfNull(probabilities);
        InputChecks.ClassNames(classNames);
        InputChecks.SameLength(labels.Length, nameof(labels), probabilities.Length, nameof(probabilities));
        int n = labels.Length, k = classNames.Count;
        InputChecks.Labels(labels, k);
        InputChecks.Probabilities(probabilities, k);

        var predicted = new int[n];
        var confusion = new int[k, k];
        var topHits = new int[k + 1];
        double logLoss = 0, brier = 0;
        for (int i = 0; i < n; i++)
        {
            var p = probabilities[i];
            int y = labels[i];
            predicted[i] = InputChecks.ArgMax(p);
            confusion[y, predicted[i]]++;
            int rank = 0;
            for (int c = 0; c < k; c++)
            {
                if (p[c] > p[y] || (p[c] == p[y] && c < y)) rank++;
                double d = p[c] - (c == y ? 1 : 0);
                brier += d * d;
            }
            topHits[rank + 1]++;
            logLoss -= Math.Log(Math.Max(p[y], LogLossFloor));
        }
        logLoss /= n;
        brier /= n;

        var topK = new SortedDictionary<int, double>();
        int cumulative = 0;
        for (int r = 1; r <= k; r++) { cumulative += topHits[r]; topK[r] = (double)cumulative / n; }

        var trueRows = new int[k];
        var predictedCount = new int[k];
        int correct = 0;
        for (int t = 0; t < k; t++)
            for (int q = 0; q < k; q++)
            {
                trueRows[t] += confusion[t, q];
                predictedCount[q] += confusion[t, q];
                if (t == q) correct += confusion[t, q];
            }

        var perClass = new ClassScores[k];
        var normalised = new double[k, k];
        double macroP = 0, macroR = 0, macroF = 0, weightedP = 0, weightedR = 0, weightedF = 0, recallSum = 0, priorLoss = 0;
        int present = 0, withTrueRows = 0;
        for (int c = 0; c < k; c++)
        {
            int tp = confusion[c, c];
            double precision = predictedCount[c] == 0 ? 0 : (double)tp / predictedCount[c];
            double recall = trueRows[c] == 0 ? 0 : (double)tp / trueRows[c];
            double f1 = precision + recall == 0 ? 0 : 2 * precision * recall / (precision + recall);
            perClass[c] = new ClassScores(classNames[c], precision, recall, f1, trueRows[c], predictedCount[c]);
            for (int q = 0; q < k; q++) normalised[c, q] = trueRows[c] == 0 ? 0 : (double)confusion[c, q] / trueRows[c];
            if (trueRows[c] > 0 || predictedCount[c] > 0) { present++; macroP += precision; macroR += recall; macroF += f1; }
            if (trueRows[c] > 0)
            {
                withTrueRows++;
                recallSum += recall;
                double share = (double)trueRows[c] / n;
                weightedP += share * precision; weightedR += share * recall; weightedF += share * f1;
                priorLoss -= share * Math.Log(share);
            }
        }
        double accuracy = (double)correct / n;
        return new ClassificationMetrics
        {
            ClassNames = classNames.ToArray(),
            Count = n,
            Accuracy = accuracy,
            BalancedAccuracy = recallSum / withTrueRows,
            // Single-label multiclass: every mistake is one false positive and one false negative, so the
            // micro averages all equal accuracy.
            MicroPrecision = accuracy,
            MicroRecall = accuracy,
            MicroF1 = accuracy,
            MacroPrecision = macroP / present,
            MacroRecall = macroR / present,
            MacroF1 = macroF / present,
            WeightedPrecision = weightedP,
            WeightedRecall = weightedR,
            WeightedF1 = weightedF,
            LogLoss = logLoss,
            LogLossGainOverPrior = priorLoss == 0 ? double.NaN : 1 - logLoss / priorLoss,
            Brier = brier,
            WithinTop = topK,
            PerClass = perClass,
            Confusion = confusion,
            ConfusionNormalised = normalised,
            Predicted = predicted,
        };
    }

    /// <summary>Per-class table (Class, Precision, Recall, F1, TrueRows, PredictedRows).</summary>
    public DataFrame ToDataFrame() => new(
        FrameColumns.Text("Class", PerClass.Select(c => c.Class)),
        FrameColumns.Number("Precision", PerClass.Select(c => c.Precision)),
        FrameColumns.Number("Recall", PerClass.Select(c => c.Recall)),
        FrameColumns.Number("F1", PerClass.Select(c => c.F1)),
        FrameColumns.Count("TrueRows", PerClass.Select(c => c.TrueRows)),
        FrameColumns.Count("PredictedRows", PerClass.Select(c => c.PredictedRows)));

    /// <summary>Headline figures as Metric/Value rows.</summary>
    public DataFrame SummaryToDataFrame()
    {
        var rows = new List<(string, double)>
        {
            ("Accuracy", Accuracy), ("BalancedAccuracy", BalancedAccuracy),
            ("MicroPrecision", MicroPrecision), ("MicroRecall", MicroRecall), ("MicroF1", MicroF1),
            ("MacroPrecision", MacroPrecision), ("MacroRecall", MacroRecall), ("MacroF1", MacroF1),
            ("WeightedPrecision", WeightedPrecision), ("WeightedRecall", WeightedRecall), ("WeightedF1", WeightedF1),
            ("LogLoss", LogLoss), ("LogLossGainOverPrior", LogLossGainOverPrior), ("Brier", Brier),
        };
        rows.AddRange(WithinTop.Select(kv => ($"AccuracyWithinTop{kv.Key}", kv.Value)));
        return new DataFrame(FrameColumns.Text("Metric", rows.Select(r => r.Item1)), FrameColumns.Number("Value", rows.Select(r => r.Item2)));
    }

    /// <summary>Confusion matrix with a True column and one column per predicted class; normalised rows when asked.</summary>
    public DataFrame ConfusionToDataFrame(bool normalised = false)
    {
        int k = ClassNames.Count;
        var columns = new List<DataFrameColumn> { FrameColumns.Text("True class", ClassNames) };
        for (int q = 0; q < k; q++)
        {
            int col = q;
            columns.Add(normalised
                ? FrameColumns.Number(ClassNames[q], Enumerable.Range(0, k).Select(t => ConfusionNormalised[t, col]))
                : FrameColumns.Count(ClassNames[q], Enumerable.Range(0, k).Select(t => Confusion[t, col])));
        }
        return new DataFrame(columns);
    }
}
