using Microsoft.Data.Analysis;

namespace Kit.Experiments;

/// <summary>One config in one rung of a search: its scores and whether it went on to the next rung.</summary>
public sealed record SearchEntry(string Config, double ValidationAccuracy, double TestAccuracy, bool Promoted, double Seconds);

/// <summary>One rung as it ran: epochs (and what was planned), each config's figures, and the decision's note.</summary>
public sealed record SearchRung(int Rung, int Epochs, int PlannedEpochs, IReadOnlyList<SearchEntry> Entries, string Note);

/// <summary>
/// A search read back from its results folder: the rungs (who ran, for how many epochs, with what validation and test
/// accuracy, who was promoted), the baselines' figures, whether and why the budget stopped it, and the pick.
/// </summary>
public sealed record SearchRecord(IReadOnlyList<SearchRung> Rungs, IReadOnlyList<SearchEntry> Baselines, SearchDecision? Stop, SearchDecision? Choice)
{
    /// <summary>True when the budget shrank a rung's epochs or stopped the search before its last rung.</summary>
    public bool BudgetCut => Stop is not null || Rungs.Any(r => r.Epochs != r.PlannedEpochs);

    /// <summary>Null when the folder holds no search (a grid sweep).</summary>
    public static SearchRecord? Read(string dir)
    {
        if (!SearchLog.Exists(dir)) return null;
        return Build(ResultsStore.Read(dir).Records, SearchLog.Read(dir));
    }

    public static SearchRecord Build(IReadOnlyList<RunRecord> records, IReadOnlyList<SearchDecision> decisions)
    {
        var rungDecisions = decisions.Where(d => d.Kind == SearchStepKind.Rung).OrderBy(d => d.Rung).ToArray();
        var byRung = records.Where(r => r.Rung is not null).ToLookup(r => r.Rung!.Value);
        var rungs = new List<SearchRung>();
        for (int i = 0; i < rungDecisions.Length; i++)
        {
            var d = rungDecisions[i];
            var next = i + 1 < rungDecisions.Length ? rungDecisions[i + 1].Configs.ToHashSet(StringComparer.Ordinal) : [];
            var entries = byRung[d.Rung].Select(r => (r, name: SearchRunner.DrawnName(r)))
                .OrderBy(x => IndexOf(d.Configs, x.name))
                .Select(x => new SearchEntry(x.name, x.r.ValidationAccuracy ?? double.NaN, x.r.Accuracy, next.Contains(x.name), x.r.Timing?.TotalSeconds ?? double.NaN))
                .ToArray();
            rungs.Add(new SearchRung(d.Rung, d.Epochs, d.PlannedEpochs, entries, d.Note));
        }
        var baselines = records.Where(r => r.Baseline)
            .Select(r => new SearchEntry(r.Config, r.ValidationAccuracy ?? double.NaN, r.Accuracy, false, r.Timing?.TotalSeconds ?? double.NaN)).ToArray();
        return new SearchRecord(rungs, baselines, decisions.FirstOrDefault(d => d.Kind == SearchStepKind.Stop),
            decisions.FirstOrDefault(d => d.Kind == SearchStepKind.Choice));
    }

    /// <summary>The runs a search's comparison shows: the last rung's configs and both baselines.</summary>
    public static IReadOnlyList<RunRecord> Finalists(IReadOnlyList<RunRecord> records, IReadOnlyList<SearchDecision> decisions)
    {
        var last = decisions.Where(d => d.Kind == SearchStepKind.Rung).MaxBy(d => d.Rung);
        return records.Where(r => r.Baseline || (last is not null && r.Rung == last.Rung)).ToArray();
    }

    static int IndexOf(IReadOnlyList<string> list, string item)
    {
        for (int i = 0; i < list.Count; i++) if (list[i] == item) return i;
        return int.MaxValue;
    }

    /// <summary>One row per config and rung.</summary>
    public DataFrame ToDataFrame()
    {
        var rows = Rungs.SelectMany(r => r.Entries.Select(e => (r, e))).ToArray();
        return new DataFrame(
            new Int32DataFrameColumn("rung", rows.Select(x => x.r.Rung)),
            new Int32DataFrameColumn("epochs", rows.Select(x => x.r.Epochs)),
            new StringDataFrameColumn("config", rows.Select(x => x.e.Config)),
            new DoubleDataFrameColumn("validation_accuracy", rows.Select(x => x.e.ValidationAccuracy)),
            new DoubleDataFrameColumn("test_accuracy", rows.Select(x => x.e.TestAccuracy)),
            new BooleanDataFrameColumn("promoted", rows.Select(x => x.e.Promoted)),
            new DoubleDataFrameColumn("seconds", rows.Select(x => x.e.Seconds)));
    }
}
