namespace Kit.Data;

/// <summary>
/// Looks for ways a split can flatter a model: a text seen in training reappearing in validation or test
/// (exactly, or after case, white-space and Unicode normalisation), one text carrying different labels, and a
/// group split across parts.
/// </summary>
public static class LeakageAudit
{
    public const int ExamplesKept = 3;

    public static LeakageReport Run(LabelledTable table, Split split)
    {
        var part = split.PartOf(table.Count);
        var findings = new List<LeakFinding>
        {
            AcrossParts(table, part, LeakFinding.ExactAcrossParts, t => t, null),
            AcrossParts(table, part, LeakFinding.NormalisedAcrossParts, TextKey.Normalise, t => t),
            Conflicts(table),
        };
        if (table.Groups is not null)
            findings.Add(AcrossParts(table, part, LeakFinding.GroupAcrossParts, null, null));
        return new LeakageReport(table.Count, findings);
    }

    /// <summary>
    /// Rows whose key was already seen in an earlier part. With <paramref name="exclude"/>, a row whose excluded
    /// key (the exact text) was also seen earlier is left out: it is already counted as an exact duplicate.
    /// A null <paramref name="key"/> means the group column.
    /// </summary>
    static LeakFinding AcrossParts(LabelledTable table, int[] part, string kind, Func<string, string>? key, Func<string, string>? exclude)
    {
        string Key(int r) => key is null ? table.Groups![r] : key(table.Texts[r]);
        var firstPart = new Dictionary<string, int>(StringComparer.Ordinal);
        var firstExact = new Dictionary<string, int>(StringComparer.Ordinal);
        var rowsByKey = new Dictionary<string, List<int>>(StringComparer.Ordinal);
        var ordered = Enumerable.Range(0, table.Count).Where(r => part[r] != Split.NoPart).OrderBy(r => part[r]).ThenBy(r => r);
        int leaking = 0;
        var leakedKeys = new List<string>();
        var leakedSet = new HashSet<string>(StringComparer.Ordinal);
        foreach (int r in ordered)
        {
            string k = Key(r);
            if (!rowsByKey.TryGetValue(k, out var list)) rowsByKey[k] = list = new List<int>();
            list.Add(r);
            if (exclude is not null) firstExact.TryAdd(exclude(table.Texts[r]), part[r]);
            if (!firstPart.TryGetValue(k, out int first)) { firstPart[k] = part[r]; continue; }
            if (first == part[r]) continue;
            if (exclude is not null && firstExact[exclude(table.Texts[r])] < part[r]) continue;
            leaking++;
            if (leakedSet.Add(k)) leakedKeys.Add(k);
        }
        var examples = leakedKeys.Take(ExamplesKept).Select(k =>
        {
            var rows = rowsByKey[k];
            string parts = string.Join(", ", rows.Select(r => Split.PartNames[part[r]]).Distinct());
            string shown = key is null ? $"group {k}" : table.Texts[rows[0]];
            string detail = key is null ? $"rows in {parts}" : $"in {parts}" + (exclude is null ? "" : ": " + string.Join(" | ", rows.Select(r => table.Texts[r]).Distinct().Take(3)));
            return new LeakExample(shown, detail, rows.Select(r => table.Lines[r]).Take(10).ToArray());
        }).ToList();
        return new LeakFinding(kind, leakedKeys.Count, leaking, examples);
    }

    static LeakFinding Conflicts(LabelledTable table)
    {
        var rowsByText = new Dictionary<string, List<int>>(StringComparer.Ordinal);
        for (int r = 0; r < table.Count; r++)
        {
            if (!rowsByText.TryGetValue(table.Texts[r], out var list)) rowsByText[table.Texts[r]] = list = new List<int>();
            list.Add(r);
        }
        var conflicting = rowsByText
            .Where(p => p.Value.Select(r => table.Labels[r]).Distinct(StringComparer.Ordinal).Skip(1).Any())
            .OrderBy(p => p.Value[0]).ToList();
        var examples = conflicting.Take(ExamplesKept).Select(p => new LeakExample(p.Key,
            "labels " + string.Join(", ", p.Value.GroupBy(r => table.Labels[r], StringComparer.Ordinal).Select(g => $"{g.Key} ×{g.Count()}")),
            p.Value.Select(r => table.Lines[r]).Take(10).ToArray())).ToList();
        return new LeakFinding(LeakFinding.ConflictingLabels, conflicting.Count, conflicting.Sum(p => p.Value.Count), examples);
    }
}
