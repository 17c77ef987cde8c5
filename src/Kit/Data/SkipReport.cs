using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>Rows dropped under <see cref="RowPolicy.Skip"/>: how many for each reason, and the first few source lines of each.</summary>
public sealed class SkipReport
{
    public const int ExamplesKept = 5;

    readonly SortedDictionary<string, int> _counts = new(StringComparer.Ordinal);
    readonly SortedDictionary<string, List<int>> _lines = new(StringComparer.Ordinal);

    public IReadOnlyDictionary<string, int> Counts => _counts;
    public int Total => _counts.Values.Sum();
    public bool IsEmpty => _counts.Count == 0;

    /// <summary>The first source lines dropped for a reason (at most <see cref="ExamplesKept"/>).</summary>
    public IReadOnlyList<int> FirstLines(string reason) => _lines.TryGetValue(reason, out var l) ? l : Array.Empty<int>();

    internal void Add(string reason, int line)
    {
        _counts[reason] = _counts.GetValueOrDefault(reason) + 1;
        if (!_lines.TryGetValue(reason, out var lines)) _lines[reason] = lines = new List<int>();
        if (lines.Count < ExamplesKept) lines.Add(line);
    }

    public override string ToString() => IsEmpty
        ? "no rows skipped"
        : $"skipped {Total} row(s): " + string.Join("; ", _counts.Select(p => $"{p.Value} {p.Key} (first at line {string.Join(", ", FirstLines(p.Key))})"));

    public DataFrame ToDataFrame() => new(
        new StringDataFrameColumn("reason", _counts.Keys),
        new Int32DataFrameColumn("rows", _counts.Values),
        new StringDataFrameColumn("first_lines", _counts.Keys.Select(k => string.Join(" ", FirstLines(k)))));
}
