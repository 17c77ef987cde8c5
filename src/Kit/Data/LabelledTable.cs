using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>
/// Labelled rows as read from a source, before tokenizing: one text and one label per row, optional group and
/// split values, and the source line of each row so later findings (duplicates, errors) can point back to it.
/// </summary>
public sealed class LabelledTable
{
    readonly string[] _texts;
    readonly string[] _labels;
    readonly string[]? _groups;
    readonly string[]? _splits;

    public string SourcePath { get; }
    public IReadOnlyList<string> Texts => _texts;
    public IReadOnlyList<string> Labels => _labels;
    /// <summary>Group key of each row, or null when the source has no group column.</summary>
    public IReadOnlyList<string>? Groups => _groups;
    /// <summary>Predefined split of each row (train / validation / test), or null when the source has none.</summary>
    public IReadOnlyList<string>? Splits => _splits;
    /// <summary>1-based source line where each row starts (for a DataFrame: 1-based row number).</summary>
    public int[] Lines { get; }
    public int Count => _texts.Length;
    public SkipReport SkipReport { get; }

    public LabelledTable(string sourcePath, string[] texts, string[] labels, string[]? groups = null, string[]? splits = null,
        int[]? lines = null, SkipReport? skipReport = null)
    {
        if (labels.Length != texts.Length) throw new ArgumentException($"{labels.Length} labels for {texts.Length} texts");
        if (groups is not null && groups.Length != texts.Length) throw new ArgumentException($"{groups.Length} groups for {texts.Length} texts");
        if (splits is not null && splits.Length != texts.Length) throw new ArgumentException($"{splits.Length} split values for {texts.Length} texts");
        lines ??= Enumerable.Range(1, texts.Length).ToArray();
        if (lines.Length != texts.Length) throw new ArgumentException($"{lines.Length} line numbers for {texts.Length} texts");
        SourcePath = sourcePath;
        _texts = texts;
        _labels = labels;
        _groups = groups;
        _splits = splits;
        Lines = lines;
        SkipReport = skipReport ?? new SkipReport();
    }

    /// <summary>Class names of this table (ordinal order, independent of row order).</summary>
    public LabelMap LabelMap() => new(_labels);

    /// <summary>Label id of every row under <paramref name="map"/> (by default this table's own map).</summary>
    public int[] LabelIds(LabelMap? map = null)
    {
        map ??= LabelMap();
        var ids = new int[_labels.Length];
        for (int i = 0; i < ids.Length; i++)
        {
            if (!map.TryGetId(_labels[i], out ids[i]))
                throw new DataError(SourcePath, Lines[i], $"label '{_labels[i]}' is not one of the known classes ({string.Join(", ", map.Names)})");
        }
        return ids;
    }

    /// <summary>A table of the given rows, in the given order, keeping their source lines.</summary>
    public LabelledTable Subset(IReadOnlyList<int> rows)
    {
        string[] Pick(string[] a) => rows.Select(r => a[r]).ToArray();
        return new LabelledTable(SourcePath, Pick(_texts), Pick(_labels), _groups is null ? null : Pick(_groups),
            _splits is null ? null : Pick(_splits), rows.Select(r => Lines[r]).ToArray(), SkipReport);
    }

    public DataFrame ToDataFrame()
    {
        var columns = new List<DataFrameColumn>
        {
            new Int32DataFrameColumn("line", Lines),
            new StringDataFrameColumn("text", _texts),
            new StringDataFrameColumn("label", _labels),
        };
        if (_groups is not null) columns.Add(new StringDataFrameColumn("group", _groups));
        if (_splits is not null) columns.Add(new StringDataFrameColumn("split", _splits));
        return new DataFrame(columns);
    }
}
