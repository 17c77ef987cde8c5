using System.Globalization;
using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>Reads labelled rows from a file (CSV, TSV, JSON Lines, chosen by extension) or from a DataFrame.</summary>
public static class TableReader
{
    public static readonly IReadOnlyList<string> Extensions = [".csv", ".tsv", ".tab", ".jsonl", ".ndjson"];

    /// <summary>
    /// Reads the whole source or nothing: on any problem under <see cref="RowPolicy.Refuse"/> a <see cref="DataError"/>
    /// is thrown and no rows are returned.
    /// </summary>
    public static LabelledTable Read(string path, ColumnSpec columns, RowPolicy policy = RowPolicy.Refuse)
    {
        string ext = Path.GetExtension(path).ToLowerInvariant();
        if (!Extensions.Contains(ext))
            throw new DataError(path, 0, $"unknown file type '{ext}' (expected one of {string.Join(", ", Extensions)})");
        byte[] bytes;
        try
        {
            bytes = File.ReadAllBytes(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new DataError(path, 0, null, $"cannot read file: {e.Message}", e);
        }
        return Parse(path, bytes, columns, policy);
    }

    /// <summary>Parses in-memory bytes as the file type of <paramref name="name"/>'s extension (tests, streams).</summary>
    public static LabelledTable Parse(string name, byte[] bytes, ColumnSpec columns, RowPolicy policy = RowPolicy.Refuse)
    {
        string text = SourceText.Decode(name, bytes);
        return Path.GetExtension(name).ToLowerInvariant() switch
        {
            ".csv" => DelimitedReader.Read(name, text, ',', columns, policy),
            ".tsv" or ".tab" => DelimitedReader.Read(name, text, '\t', columns, policy),
            ".jsonl" or ".ndjson" => JsonLinesReader.Read(name, text, columns, policy),
            var ext => throw new DataError(name, 0, $"unknown file type '{ext}' (expected one of {string.Join(", ", Extensions)})"),
        };
    }

    /// <summary>
    /// Takes rows from a DataFrame. Line numbers are 1-based row numbers; a null cell counts as missing.
    /// Non-string cells are taken as their invariant-culture text.
    /// </summary>
    public static LabelledTable FromDataFrame(DataFrame df, ColumnSpec columns, string name = "dataframe", RowPolicy policy = RowPolicy.Refuse)
    {
        DataFrameColumn Column(string c)
        {
            int at = df.Columns.IndexOf(c);
            if (at < 0) throw new DataError(name, 0, $"missing column '{c}' (columns: {string.Join(", ", df.Columns.Select(k => $"'{k.Name}'"))})");
            return df.Columns[at];
        }
        var text = Column(columns.Text);
        var label = Column(columns.Label);
        var group = columns.Group is null ? null : Column(columns.Group);
        var split = columns.Split is null ? null : Column(columns.Split);
        if (df.Rows.Count == 0) throw new DataError(name, 0, "empty DataFrame: no rows");

        var rows = new RowCollector(name, columns, policy);
        for (long i = 0; i < df.Rows.Count; i++)
        {
            int line = checked((int)i + 1);
            string? t = Cell(text, i);
            if (t is null)
            {
                rows.Problem(line, null, "empty text", $"empty text in column '{columns.Text}' (null)");
                continue;
            }
            rows.Add(line, t, Cell(label, i), group is null ? default : Cell(group, i), split is null ? default : Cell(split, i));
        }
        return rows.Build(0);
    }

    static string? Cell(DataFrameColumn column, long row) => column[row] switch
    {
        null => null,
        string s => s,
        IFormattable f => f.ToString(null, CultureInfo.InvariantCulture),
        var o => o.ToString(),
    };
}
