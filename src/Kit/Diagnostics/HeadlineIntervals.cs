using Kit.Common;
using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// 95 % intervals for the two headline scores of one split. Accuracy: Wilson's score interval on the count of
/// correct rows (see <see cref="Wilson"/>). Macro F1 has no closed form, so a percentile bootstrap (Efron and
/// Tibshirani 1993, ch. 13): each replicate redraws the split's rows with replacement and recomputes macro F1 the
/// way <see cref="ClassificationMetrics"/> does (over the classes present as a true or predicted label).
/// Both describe the test sample's uncertainty, not the spread between training runs (seeds give that).
/// </summary>
public sealed record HeadlineIntervals(double Accuracy, double AccuracyLow, double AccuracyHigh,
    double MacroF1, double MacroF1Low, double MacroF1High, int Replicates, ulong Seed)
{
    /// <summary>From the confusion matrix alone: macro F1 depends on the rows only through it.</summary>
    public static HeadlineIntervals Of(ClassificationMetrics metrics, int replicates = 1000, ulong seed = 1)
    {
        ArgumentNullException.ThrowIfNull(metrics);
        if (replicates < 1) throw new ArgumentOutOfRangeException(nameof(replicates), $"replicates = {replicates} must be positive.");
        var confusion = metrics.Confusion;
        int k = confusion.GetLength(0), n = metrics.Count, correct = 0;
        var truth = new int[n];
        var called = new int[n];
        int at = 0;
        for (int t = 0; t < k; t++)
            for (int p = 0; p < k; p++)
            {
                if (t == p) correct += confusion[t, p];
                for (int c = 0; c < confusion[t, p]; c++) { truth[at] = t; called[at] = p; at++; }
            }
        var (low, high) = Wilson.Interval(correct, n);

        var rng = new SplitMix64(seed);
        var values = new double[replicates];
        var hits = new int[k];
        var trueRows = new int[k];
        var predictedRows = new int[k];
        for (int r = 0; r < replicates; r++)
        {
            Array.Clear(hits);
            Array.Clear(trueRows);
            Array.Clear(predictedRows);
            for (int i = 0; i < n; i++)
            {
                int row = rng.NextInt(n);
                trueRows[truth[row]]++;
                predictedRows[called[row]]++;
                if (truth[row] == called[row]) hits[truth[row]]++;
            }
            values[r] = MacroF1Of(hits, trueRows, predictedRows);
        }
        Array.Sort(values);
        return new HeadlineIntervals(metrics.Accuracy, low, high, metrics.MacroF1,
            CalibrationReport.Quantile(values, 0.025), CalibrationReport.Quantile(values, 0.975), replicates, seed);
    }

    /// <summary>F1 of a class is 2·hits / (true rows + predicted rows), the same as 2PR / (P + R) with 0 for no hits.</summary>
    internal static double MacroF1Of(int[] hits, int[] trueRows, int[] predictedRows)
    {
        double sum = 0;
        int present = 0;
        for (int c = 0; c < hits.Length; c++)
        {
            int rows = trueRows[c] + predictedRows[c];
            if (rows == 0) continue;
            present++;
            sum += 2.0 * hits[c] / rows;
        }
        return present == 0 ? double.NaN : sum / present;
    }

    /// <summary>Metric, Value, Low, High.</summary>
    public DataFrame ToDataFrame() => new(
        FrameColumns.Text("Metric", new[] { "Accuracy", "MacroF1" }),
        FrameColumns.Number("Value", new[] { Accuracy, MacroF1 }),
        FrameColumns.Number("Low", new[] { AccuracyLow, MacroF1Low }),
        FrameColumns.Number("High", new[] { AccuracyHigh, MacroF1High }));
}
