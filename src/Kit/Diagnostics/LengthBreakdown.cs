using System.Globalization;
using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Accuracy and macro-F1 per bin of sequence length (or of any numeric attribute, or per named group), with
/// Wilson intervals so a reader can tell a real dip from a small-bin wobble, and a class × bin table.
/// </summary>
public sealed record LengthBreakdown(string Attribute, IReadOnlyList<BinScores> Rows, ClassByBinTable ByClass)
{
    public static LengthBreakdown Compute(int[] labels, int[] predicted, int[] lengths, IReadOnlyList<string> classNames, LengthBins bins)
    {
        ArgumentNullException.ThrowIfNull(lengths);
        return ByValue(labels, predicted, lengths.Select(l => (double)l).ToArray(), classNames, bins, "Length");
    }

    /// <summary>Same as <see cref="Compute"/> for any numeric per-example attribute (e.g. token count, digit share).</summary>
    public static LengthBreakdown ByValue(int[] labels, int[] predicted, double[] values, IReadOnlyList<string> classNames,
        LengthBins bins, string attribute = "Value")
    {
        Check(labels, predicted, classNames);
        ArgumentNullException.ThrowIfNull(values);
        ArgumentNullException.ThrowIfNull(bins);
        InputChecks.SameLength(labels.Length, nameof(labels), values.Length, nameof(values));
        for (int i = 0; i < values.Length; i++)
            if (!double.IsFinite(values[i]))
                throw new ArgumentException($"values[{i}] = {values[i]} is not a finite number.", nameof(values));
        double[] edges = bins.EdgesFor(values);
        var binOf = new int[values.Length];
        for (int i = 0; i < values.Length; i++)
        {
            binOf[i] = LengthBins.Locate(edges, values[i]);
            if (binOf[i] < 0)
                throw new ArgumentException(
                    $"{attribute.ToLowerInvariant()} of example {i} is {InputChecks.Show(values[i])}, outside the bin edges [{InputChecks.Show(edges[0])}, {InputChecks.Show(edges[^1])}]; widen the edges.",
                    nameof(values));
        }
        var names = new string[edges.Length - 1];
        var lo = new double[names.Length];
        var hi = new double[names.Length];
        for (int b = 0; b < names.Length; b++)
        {
            lo[b] = edges[b]; hi[b] = edges[b + 1];
            names[b] = string.Create(CultureInfo.InvariantCulture, $"[{edges[b]:G6}, {edges[b + 1]:G6}{(b == names.Length - 1 ? "]" : ")")}");
        }
        return Build(attribute, labels, predicted, classNames, binOf, names, lo, hi);
    }

    /// <summary>One row per distinct group value, in ordinal order of the names.</summary>
    public static LengthBreakdown ByGroup(int[] labels, int[] predicted, string[] groups, IReadOnlyList<string> classNames, string attribute = "Group")
    {
        Check(labels, predicted, classNames);
        ArgumentNullException.ThrowIfNull(groups);
        InputChecks.SameLength(labels.Length, nameof(labels), groups.Length, nameof(groups));
        for (int i = 0; i < groups.Length; i++)
            if (groups[i] is null) throw new ArgumentException($"groups[{i}] is null; give every example a group name.", nameof(groups));
        var names = groups.Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).ToArray();
        var index = names.Select((g, i) => (g, i)).ToDictionary(t => t.g, t => t.i, StringComparer.Ordinal);
        var nan = Enumerable.Repeat(double.NaN, names.Length).ToArray();
        return Build(attribute, labels, predicted, classNames, groups.Select(g => index[g]).ToArray(), names, nan, nan);
    }

    static void Check(int[] labels, int[] predicted, IReadOnlyList<string> classNames)
    {
        InputChecks.NotEmpty(labels, nameof(labels));
        ArgumentNullException.ThrowIfNull(predicted);
        InputChecks.ClassNames(classNames);
        InputChecks.SameLength(labels.Length, nameof(labels), predicted.Length, nameof(predicted));
        InputChecks.Labels(labels, classNames.Count);
        InputChecks.Labels(predicted, classNames.Count, nameof(predicted));
    }

    static LengthBreakdown Build(string attribute, int[] labels, int[] predicted, IReadOnlyList<string> classNames, int[] binOf,
        string[] names, double[] lo, double[] hi)
    {
        int k = classNames.Count, bins = names.Length;
        var confusion = new int[bins][,];
        for (int b = 0; b < bins; b++) confusion[b] = new int[k, k];
        var count = new int[k, bins];
        var correct = new int[k, bins];
        for (int i = 0; i < labels.Length; i++)
        {
            confusion[binOf[i]][labels[i], predicted[i]]++;
            count[labels[i], binOf[i]]++;
            if (labels[i] == predicted[i]) correct[labels[i], binOf[i]]++;
        }
        var rows = new BinScores[bins];
        for (int b = 0; b < bins; b++)
        {
            int n = 0, hits = 0;
            for (int c = 0; c < k; c++) { n += count[c, b]; hits += correct[c, b]; }
            var (wl, wh) = Wilson.Interval(hits, n);
            rows[b] = new BinScores(names[b], lo[b], hi[b], n, hits, n == 0 ? double.NaN : (double)hits / n, wl, wh, MacroF1(confusion[b]));
        }
        return new LengthBreakdown(attribute, rows, new ClassByBinTable(classNames.ToArray(), names, count, correct));
    }

    /// <summary>Macro-F1 over classes that occur as true or predicted label in this confusion matrix; NaN if empty.</summary>
    internal static double MacroF1(int[,] confusion)
    {
        int k = confusion.GetLength(0), present = 0;
        double sum = 0;
        for (int c = 0; c < k; c++)
        {
            int support = 0, predictedCount = 0;
            for (int q = 0; q < k; q++) { support += confusion[c, q]; predictedCount += confusion[q, c]; }
            if (support == 0 && predictedCount == 0) continue;
            present++;
            int tp = confusion[c, c];
            // F1 = 2TP / (2TP + FP + FN) avoids the 0/0 of precision for never-predicted classes.
            sum += 2.0 * tp / (support + predictedCount);
        }
        return present == 0 ? double.NaN : sum / present;
    }

    /// <summary>Rows as a table: Bin, Lo, Hi, Count, Correct, Accuracy, WilsonLow, WilsonHigh, MacroF1.</summary>
    public DataFrame ToDataFrame() => new(
        FrameColumns.Text("Bin", Rows.Select(r => r.Bin)),
        FrameColumns.Number("Lo", Rows.Select(r => r.Lo)),
        FrameColumns.Number("Hi", Rows.Select(r => r.Hi)),
        FrameColumns.Count("Count", Rows.Select(r => r.Count)),
        FrameColumns.Count("Correct", Rows.Select(r => r.Correct)),
        FrameColumns.Number("Accuracy", Rows.Select(r => r.Accuracy)),
        FrameColumns.Number("WilsonLow", Rows.Select(r => r.WilsonLow)),
        FrameColumns.Number("WilsonHigh", Rows.Select(r => r.WilsonHigh)),
        FrameColumns.Number("MacroF1", Rows.Select(r => r.MacroF1)));
}
