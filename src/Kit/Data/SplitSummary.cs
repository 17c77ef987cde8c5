using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>One part of a split: its size, class counts and proportions, and lengths (when lengths were given).</summary>
public sealed record PartSummary(string Part, int Rows, int[] ClassCounts, double[] Proportions, LengthStats Lengths);

/// <summary>How a split came out: one <see cref="PartSummary"/> per part, plus how it was made.</summary>
public sealed record SplitSummary(string Method, ulong Seed, int Rows, IReadOnlyList<PartSummary> Parts)
{
    /// <summary>Names of the class ids, when known (prepared data sets them), so the summary can be shown on its own.</summary>
    public IReadOnlyList<string>? ClassNames { get; init; }

    public static SplitSummary Of(string method, ulong seed, int[] labels, int[]? lengths, params (string Name, int[] Rows)[] parts)
    {
        int classes = labels.Length == 0 ? 0 : labels.Max() + 1;
        var summaries = parts.Select(p =>
        {
            var counts = new int[classes];
            foreach (int r in p.Rows) counts[labels[r]]++;
            var proportions = counts.Select(c => p.Rows.Length == 0 ? 0.0 : (double)c / p.Rows.Length).ToArray();
            var stats = lengths is null ? LengthStats.Empty : LengthStats.Of(p.Rows.Select(r => lengths[r]));
            return new PartSummary(p.Name, p.Rows.Length, counts, proportions, stats);
        }).ToArray();
        return new SplitSummary(method, seed, labels.Length, summaries);
    }

    /// <summary>Long format: one row per part and class.</summary>
    public DataFrame ToDataFrame(IReadOnlyList<string>? classNames = null)
    {
        classNames ??= ClassNames;
        var part = new List<string>();
        var cls = new List<string>();
        var count = new List<int>();
        var share = new List<double>();
        foreach (var p in Parts)
            for (int c = 0; c < p.ClassCounts.Length; c++)
            {
                part.Add(p.Part);
                cls.Add(classNames is not null && c < classNames.Count ? classNames[c] : c.ToString(System.Globalization.CultureInfo.InvariantCulture));
                count.Add(p.ClassCounts[c]);
                share.Add(p.Proportions[c]);
            }
        return new DataFrame(new StringDataFrameColumn("part", part), new StringDataFrameColumn("class", cls),
            new Int32DataFrameColumn("rows", count), new DoubleDataFrameColumn("proportion", share));
    }

    public DataFrame LengthsToDataFrame() => LengthStats.ToDataFrame(Parts.Select(p => p.Part).ToArray(), Parts.Select(p => p.Lengths).ToArray());
}
