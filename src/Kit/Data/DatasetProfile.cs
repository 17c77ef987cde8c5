using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>Rows and length figures of one class in a <see cref="DatasetProfile"/>.</summary>
public sealed record ClassProfile(string Name, int Rows, double Proportion, LengthStats Lengths);

/// <summary>One bar of the length histogram: lengths in [From, To], rows per class.</summary>
public sealed record LengthBin(int From, int To, int[] RowsByClass)
{
    public int Rows => RowsByClass.Sum();
}

/// <summary>
/// How many distinct tokens the data uses and how concentrated they are: how many of the most frequent
/// types cover 90 / 95 / 99 % of all occurrences, and how many types occur only once.
/// </summary>
public sealed record TokenCoverage(long Occurrences, int Types, int Singletons, int TypesFor90, int TypesFor95, int TypesFor99);

/// <summary>
/// A first look at a labelled table under one tokenizer: class balance, token lengths overall and per class,
/// a length histogram per class, and token coverage. Lengths are counted before any truncation.
/// </summary>
public sealed record DatasetProfile(string Source, string Tokenizer, int Rows, IReadOnlyList<ClassProfile> Classes,
    LengthStats Lengths, IReadOnlyList<LengthBin> Histogram, TokenCoverage Coverage, int[] RowLengths)
{
    public const int HistogramBins = 20;

    /// <summary>Largest class over smallest class (1 = balanced).</summary>
    public double ImbalanceRatio => Classes.Count == 0 ? double.NaN : (double)Classes.Max(c => c.Rows) / Classes.Min(c => c.Rows);

    public static DatasetProfile Compute(LabelledTable table, ITokenizer tokenizer) =>
        Compute(table, tokenizer.Name, table.Texts.Select(tokenizer.Split).ToArray());

    /// <summary>The profile of rows already split into tokens (one entry per table row).</summary>
    public static DatasetProfile Compute(LabelledTable table, string tokenizerName, IReadOnlyList<IReadOnlyList<string>> rows)
    {
        if (rows.Count != table.Count) throw new ArgumentException($"{rows.Count} token rows for a table of {table.Count}");
        var map = table.LabelMap();
        var labels = table.LabelIds(map);
        var lengths = new int[table.Count];
        var counts = new Dictionary<string, long>(StringComparer.Ordinal);
        for (int i = 0; i < table.Count; i++)
        {
            var pieces = rows[i];
            lengths[i] = pieces.Count;
            foreach (var p in pieces) counts[p] = counts.GetValueOrDefault(p) + 1;
        }
        var classes = Enumerable.Range(0, map.Count).Select(c =>
        {
            var rows = Enumerable.Range(0, labels.Length).Where(i => labels[i] == c).ToArray();
            return new ClassProfile(map.Names[c], rows.Length, (double)rows.Length / table.Count, LengthStats.Of(rows.Select(i => lengths[i])));
        }).ToArray();
        return new DatasetProfile(table.SourcePath, tokenizerName, table.Count, classes, LengthStats.Of(lengths),
            BuildHistogram(lengths, labels, map.Count), CountCoverage(counts), lengths);
    }

    static List<LengthBin> BuildHistogram(int[] lengths, int[] labels, int classes)
    {
        var bins = new List<LengthBin>();
        if (lengths.Length == 0) return bins;
        int min = lengths.Min(), max = lengths.Max();
        int width = Math.Max(1, (int)Math.Ceiling((max - min + 1) / (double)HistogramBins));
        for (int from = min; from <= max; from += width) bins.Add(new LengthBin(from, Math.Min(max, from + width - 1), new int[classes]));
        for (int i = 0; i < lengths.Length; i++) bins[(lengths[i] - min) / width].RowsByClass[labels[i]]++;
        return bins;
    }

    static TokenCoverage CountCoverage(Dictionary<string, long> counts)
    {
        var sorted = counts.Values.OrderByDescending(c => c).ToArray();
        long total = sorted.Sum();
        int TypesFor(double share)
        {
            long running = 0;
            for (int i = 0; i < sorted.Length; i++)
            {
                running += sorted[i];
                if (running >= share * total) return i + 1;
            }
            return sorted.Length;
        }
        return new TokenCoverage(total, sorted.Length, sorted.Count(c => c == 1), TypesFor(0.90), TypesFor(0.95), TypesFor(0.99));
    }

    /// <summary>Class balance and per-class lengths, one row per class.</summary>
    public DataFrame ToDataFrame() => new(
        new StringDataFrameColumn("class", Classes.Select(c => c.Name)),
        new Int32DataFrameColumn("rows", Classes.Select(c => c.Rows)),
        new DoubleDataFrameColumn("proportion", Classes.Select(c => c.Proportion)),
        new Int32DataFrameColumn("min_length", Classes.Select(c => c.Lengths.Min)),
        new DoubleDataFrameColumn("median_length", Classes.Select(c => c.Lengths.Median)),
        new DoubleDataFrameColumn("p90_length", Classes.Select(c => c.Lengths.P90)),
        new Int32DataFrameColumn("max_length", Classes.Select(c => c.Lengths.Max)),
        new DoubleDataFrameColumn("mean_length", Classes.Select(c => c.Lengths.Mean)));

    /// <summary>Long format: one row per histogram bin and class.</summary>
    public DataFrame HistogramToDataFrame()
    {
        var rows = Histogram.SelectMany(b => Classes.Select((c, k) => (b, c.Name, n: b.RowsByClass[k]))).ToList();
        return new DataFrame(
            new Int32DataFrameColumn("from", rows.Select(r => r.b.From)),
            new Int32DataFrameColumn("to", rows.Select(r => r.b.To)),
            new StringDataFrameColumn("class", rows.Select(r => r.Name)),
            new Int32DataFrameColumn("rows", rows.Select(r => r.n)));
    }

    public DataFrame CoverageToDataFrame() => new(
        new Int64DataFrameColumn("occurrences", [Coverage.Occurrences]),
        new Int32DataFrameColumn("types", [Coverage.Types]),
        new Int32DataFrameColumn("singletons", [Coverage.Singletons]),
        new Int32DataFrameColumn("types_for_90pct", [Coverage.TypesFor90]),
        new Int32DataFrameColumn("types_for_95pct", [Coverage.TypesFor95]),
        new Int32DataFrameColumn("types_for_99pct", [Coverage.TypesFor99]));
}
