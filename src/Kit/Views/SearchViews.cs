using System.Globalization;
using Kit.Experiments;

namespace Kit.Views;

/// <summary>
/// The view of a <see cref="SearchRecord"/>: what the search decided, rung by rung (configs, epochs, validation and
/// test accuracy, promoted or not), then the baselines beside it and the pick. Promotions and the pick use the
/// validation column only; the test column is shown so a reader can see how well validation ranked the configs.
/// </summary>
public static class SearchViews
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The rungs view of a comparison that came from a search; nothing for a grid sweep.</summary>
    public static IEnumerable<IView> For(ComparisonRecord c) => c.Search is null ? [] : [Rungs(c.Search)];

    /// <summary>The choice names the run's config (drawn settings plus the rung's epochs).</summary>
    static bool IsChoice(SearchRecord s, SearchRung r, SearchEntry e) =>
        s.Choice?.Configs.FirstOrDefault() is { } chosen && s.Choice.Epochs == r.Epochs
        && SweepConfig.Of(chosen.Split(';').Select(p => p.Split('=')).Where(p => p[0] != "epochs").Select(p => (p[0], p[1])).ToArray()).Name == e.Config;

    public static TextView Rungs(SearchRecord s)
    {
        var rows = s.Rungs.SelectMany(r => r.Entries.Select(e => (IReadOnlyList<string>)new[]
        {
            r.Rung.ToString(Inv), r.Epochs == r.PlannedEpochs ? r.Epochs.ToString(Inv) : $"{r.Epochs} (planned {r.PlannedEpochs})",
            e.Config, Html.Pct(e.ValidationAccuracy, 2), Html.Pct(e.TestAccuracy, 2), Html.Num(e.Seconds, 1),
            r == s.Rungs[^1] && IsChoice(s, r, e) ? "chosen" : e.Promoted ? "promoted" : r == s.Rungs[^1] ? "finalist" : "",
        }));
        rows = rows.Concat(s.Baselines.Select(b => (IReadOnlyList<string>)new[]
        {
            "–", "–", b.Config + " (baseline)", Html.Pct(b.ValidationAccuracy, 2), Html.Pct(b.TestAccuracy, 2), Html.Num(b.Seconds, 1),
            s.Choice?.Configs.FirstOrDefault() == b.Config ? "chosen" : "",
        }));
        string table = Html.Table(["rung", "epochs", "config", "validation accuracy", "test accuracy", "seconds", "outcome"], rows.ToList(),
            "Successive halving (Jamieson & Talwalkar 2016): each rung keeps its best by validation accuracy for more epochs; the test column is never used to choose",
            numericRight: true, textColumns: [2, 6]);
        var lines = s.Rungs.Select(r => $"Rung {r.Rung}: {r.Entries.Count} config(s) × {r.Epochs} epoch(s) — {r.Note}.").ToList();
        if (s.Stop is not null) lines.Add($"The budget cut the search short before rung {s.Stop.Rung}: {s.Stop.Note}.");
        else if (s.BudgetCut) lines.Add("The budget cut the search short: a rung ran fewer epochs than planned.");
        if (s.Choice is not null) lines.Add($"Chosen: {s.Choice.Configs[0]} ({s.Choice.Note}); model written to {s.Choice.ModelFile} in the results folder, for kit score.");
        string text = "<ul>" + string.Concat(lines.Select(l => $"<li>{Html.Escape(l)}</li>")) + "</ul>";
        return new TextView("Search rungs", text + table);
    }
}
