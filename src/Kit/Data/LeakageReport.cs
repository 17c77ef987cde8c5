using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>One example of a finding: the text, what is wrong with it, and the source lines involved.</summary>
public sealed record LeakExample(string Text, string Detail, int[] Lines);

/// <summary>
/// One kind of finding. Texts counts distinct texts (or groups) involved; Rows counts the rows that carry the
/// problem (for cross-part kinds: rows that repeat something already in an earlier part, train before
/// validation before test).
/// </summary>
public sealed record LeakFinding(string Kind, int Texts, int Rows, IReadOnlyList<LeakExample> Examples)
{
    public const string ExactAcrossParts = "exact duplicate across parts";
    public const string NormalisedAcrossParts = "duplicate across parts after normalisation";
    public const string ConflictingLabels = "same text with conflicting labels";
    public const string GroupAcrossParts = "group in more than one part";
}

/// <summary>What <see cref="LeakageAudit"/> found; <see cref="Clean"/> when nothing.</summary>
public sealed record LeakageReport(int Rows, IReadOnlyList<LeakFinding> Findings)
{
    public bool Clean => Findings.All(f => f.Rows == 0);

    public LeakFinding this[string kind] => Findings.First(f => f.Kind == kind);

    public DataFrame ToDataFrame() => new(
        new StringDataFrameColumn("finding", Findings.Select(f => f.Kind)),
        new Int32DataFrameColumn("texts", Findings.Select(f => f.Texts)),
        new Int32DataFrameColumn("rows", Findings.Select(f => f.Rows)));

    public DataFrame ExamplesToDataFrame()
    {
        var all = Findings.SelectMany(f => f.Examples.Select(e => (f.Kind, e))).ToList();
        return new DataFrame(
            new StringDataFrameColumn("finding", all.Select(x => x.Kind)),
            new StringDataFrameColumn("text", all.Select(x => x.e.Text)),
            new StringDataFrameColumn("detail", all.Select(x => x.e.Detail)),
            new StringDataFrameColumn("lines", all.Select(x => string.Join(" ", x.e.Lines))));
    }
}
