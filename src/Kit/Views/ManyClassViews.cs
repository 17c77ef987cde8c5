using System.Globalization;
using System.Text.Json.Nodes;
using Kit.Data;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>
/// The per-class views in the forms that stay readable with many classes (more than <see cref="ManyClasses.Threshold"/>):
/// confusion matrices in an order that puts confused classes together, with numbers only where they fit, and a
/// ranked table of the pairs mixed up most; per-class scores as one sorted row per class; the length histogram
/// with the largest classes in colour and the rest in one band; reliability panels for the classes that add most
/// to the classwise ECE, with every class in a table. The usual views call these themselves above the threshold.
/// </summary>
public static class ManyClassViews
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Pixels per heat map row; the chart width the cell-size decision starts from (the report's column less side margins) and the colour bar's share of it.</summary>
    const double CellPixels = 18, NominalChartWidth = 880, ColourBarPixels = 110;
    const double TickFont = 11, CellFont = 9;

    /// <summary>
    /// The confusion matrix with rows and columns in the leaf order of an average-linkage clustering of the
    /// symmetrised confusion rates, so classes that are mixed up with each other form blocks near the diagonal.
    /// The colour scale stops at the largest off-diagonal value (diagonal cells are drawn at full colour), so the
    /// mistakes show; a number is printed only in a non-empty cell wide enough for it.
    /// </summary>
    public static ChartView Confusion(ClassificationMetrics m, bool normalised)
    {
        var names = m.ClassNames;
        int k = names.Count;
        int[] order = ConfusionOrder.Of(m);
        double labelWidth = names.Max(n => ManyClasses.TextWidth(n, TickFont));
        double cell = Math.Min(CellPixels, (NominalChartWidth - (labelWidth + 48) - ColourBarPixels) / k);
        var z = new JsonArray();
        var text = new JsonArray();
        var custom = new JsonArray();
        double offMax = 0;
        foreach (int i in order)
        {
            var row = new JsonArray();
            var trow = new JsonArray();
            var crow = new JsonArray();
            foreach (int j in order)
            {
                double v = normalised ? m.ConfusionNormalised[i, j] : m.Confusion[i, j];
                if (!double.IsFinite(v)) v = 0;
                if (i != j) offMax = Math.Max(offMax, v);
                row.Add(v);
                crow.Add(m.Confusion[i, j]);
                string label = m.Confusion[i, j] == 0 ? "" : normalised ? ShortPct(v) : m.Confusion[i, j].ToString(Inv);
                trow.Add(label.Length > 0 && ManyClasses.TextWidth(label, CellFont) + 2 <= cell ? label : "");   // rows are CellPixels tall, room for CellFont
            }
            z.Add(row);
            text.Add(trow);
            custom.Add(crow);
        }
        var ordered = order.Select(i => names[i]).ToArray();
        var trace = new JsonObject
        {
            ["type"] = "heatmap", ["z"] = z, ["text"] = text, ["texttemplate"] = "%{text}", ["textfont"] = new JsonObject { ["size"] = CellFont },
            ["customdata"] = custom, ["x"] = Figure.Texts(ordered), ["y"] = Figure.Texts(ordered), ["xgap"] = 1, ["ygap"] = 1,
            ["colorscale"] = Theme.SequentialScale(), ["showscale"] = true, ["zmin"] = 0.0, ["zmax"] = offMax > 0 ? offMax : 1.0,
            ["hovertemplate"] = normalised
                ? "true %{y}<br>predicted %{x}<br>%{z:.1%} of the true class (%{customdata} rows)<extra></extra>"
                : "true %{y}<br>predicted %{x}<br>%{z} rows<extra></extra>",
            ["colorbar"] = new JsonObject
            {
                // Beside the bar, turned: above it the title runs into the top tick label (the cap is stated in the caption).
                ["title"] = new JsonObject { ["text"] = normalised ? "share of row" : "rows", ["side"] = "right" },
            },
        };
        var bar = trace["colorbar"]!.AsObject();
        double top = offMax > 0 ? offMax : 1.0;
        if (normalised) bar["tickformat"] = top >= 0.2 ? ".0%" : top >= 0.02 ? ".1%" : ".2%";   // enough decimals that no two ticks read the same
        else { bar["tickformat"] = "d"; bar["tick0"] = 0; bar["dtick"] = Math.Max(1, Math.Ceiling(top / 6)); }   // whole rows, one label per step
        string title = normalised
            ? "Confusion matrix, row-normalised, classes clustered — blocks near the diagonal are classes mixed up with each other"
            : "Confusion matrix, counts, classes clustered — blocks near the diagonal are classes mixed up with each other";
        int plot = (int)Math.Ceiling(CellPixels * k);
        int bottom = (int)Math.Ceiling(labelWidth) + 48;
        var layout = Theme.Layout(title, "predicted class", "true class", height: Theme.TwoLineTop + plot + bottom);
        layout["margin"]!["b"] = bottom;
        layout["margin"]!["l"] = (int)Math.Ceiling(labelWidth) + 48;
        foreach (var axis in new[] { "xaxis", "yaxis" })
        {
            layout[axis]!["showgrid"] = false;
            layout[axis]!["dtick"] = 1;
            layout[axis]!["tickfont"] = new JsonObject { ["size"] = TickFont };
        }
        layout["yaxis"]!["autorange"] = "reversed";
        layout["xaxis"]!["tickangle"] = -90;
        string numbers = normalised ? "Numbers are percent of the true class's rows (“<1” for a share under half a percent)" : "Numbers are rows";
        return new ChartView(normalised ? "Confusion matrix (normalised)" : "Confusion matrix (counts)", new JsonArray(trace), layout)
        {
            Caption = $"{k} classes, ordered by an average-linkage clustering of the symmetrised confusion rates. {numbers}, printed only where the cell is not empty and wide enough; hover any cell for its value. The colour scale stops at the largest off-diagonal value.",
        };
    }

    static string ShortPct(double v)
    {
        double p = 100 * v;
        return p < 0.5 ? "<1" : p.ToString("F0", Inv);
    }

    /// <summary>The (true, predicted) pairs with the most test rows, with the share of the true class and the count the other way round.</summary>
    public static TextView ConfusedPairs(ClassificationMetrics m, int top = ManyClasses.ConfusedPairs, string split = "test")
    {
        int k = m.ClassNames.Count;
        var pairs = new List<(int True, int Predicted, int Rows)>();
        for (int i = 0; i < k; i++)
            for (int j = 0; j < k; j++)
                if (i != j && m.Confusion[i, j] > 0) pairs.Add((i, j, m.Confusion[i, j]));
        var ranked = pairs.OrderByDescending(p => p.Rows).ThenBy(p => p.True).ThenBy(p => p.Predicted).Take(top).ToArray();
        int mistakes = pairs.Sum(p => p.Rows);
        var rows = ranked.Select((p, r) =>
        {
            int trueRows = m.PerClass[p.True].TrueRows;
            return (IReadOnlyList<string>)new[]
            {
                (r + 1).ToString(Inv), m.ClassNames[p.True], m.ClassNames[p.Predicted], Html.Count(p.Rows),
                Html.Pct(trueRows == 0 ? double.NaN : (double)p.Rows / trueRows), Html.Pct(mistakes == 0 ? double.NaN : (double)p.Rows / mistakes),
                Html.Count(m.Confusion[p.Predicted, p.True]),
            };
        });
        string caption = ranked.Length == 0 ? $"No {split} row was mixed up." :
            $"Most confused pairs ({split} split): the top {ranked.Length} of {pairs.Count} (true, predicted) pairs with mistakes; together {Html.Pct((double)ranked.Sum(p => p.Rows) / mistakes)} of all {Html.Count(mistakes)} mistakes";
        return new TextView("Most confused pairs", Html.Table(new[] { "rank", "true class", "predicted as", "rows", "share of the true class", "share of all mistakes", "the other way (rows)" },
            rows, caption, textColumns: new[] { 1, 2 }));
    }

    /// <summary>One row per class, sorted by F1 (weakest at the top): a bar for F1, markers for precision and recall.</summary>
    public static ChartView PerClass(ClassificationMetrics m, string split = "test")
    {
        var sorted = m.PerClass.OrderBy(c => double.IsNaN(c.F1) ? -1 : c.F1).ThenBy(c => c.Class, StringComparer.Ordinal).ToArray();
        var ticks = sorted.Select(c => $"{c.Class} (n={c.TrueRows})").ToArray();
        var y = Figure.Texts(ticks);
        var traces = new JsonArray
        {
            new JsonObject
            {
                ["type"] = "bar", ["orientation"] = "h", ["name"] = "F1", ["x"] = Figure.Numbers(sorted.Select(c => c.F1)), ["y"] = y.DeepClone(),
                ["marker"] = new JsonObject { ["color"] = Theme.Tint(0, 0.75) }, ["hovertemplate"] = "%{y}<br>F1 %{x:.3f}<extra></extra>",
            },
        };
        var marks = new (string Name, Func<ClassScores, double> Get, int Colour, string Symbol)[]
            { ("precision", c => c.Precision, 1, "diamond"), ("recall", c => c.Recall, 2, "circle") };
        foreach (var (name, get, colour, symbol) in marks)
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "markers", ["name"] = name, ["x"] = Figure.Numbers(sorted.Select(get)), ["y"] = y.DeepClone(),
                ["marker"] = Figure.Marker(Theme.Colour(colour), 8, symbol), ["hovertemplate"] = $"%{{y}}<br>{name} %{{x:.3f}}<extra></extra>",
            });
        var weakest = sorted.FirstOrDefault(c => c.TrueRows > 0);
        string title = weakest is null ? $"Per-class scores ({split} split), sorted by F1"
            : $"Per-class scores ({split} split), sorted by F1 — weakest: {weakest.Class} ({Html.Num(weakest.F1)}); bars F1, markers precision and recall";
        int rowPixels = 20;
        var layout = Theme.Layout(title, "score (0 to 1)", "class (test rows in brackets)", height: Theme.TwoLineTop + 60 + rowPixels * sorted.Length);
        layout["xaxis"]!["range"] = Figure.Pair(0, 1.02);
        layout["xaxis"]!["side"] = "top";
        layout["yaxis"]!["autorange"] = "reversed";
        layout["yaxis"]!["dtick"] = 1;
        layout["yaxis"]!["tickfont"] = new JsonObject { ["size"] = TickFont };
        layout["margin"]!["l"] = (int)Math.Ceiling(ticks.Max(t => ManyClasses.TextWidth(t, TickFont))) + 48;
        layout["margin"]!["t"] = Theme.TwoLineTop + 40;   // the x axis and its title sit above the rows
        layout["margin"]!["b"] = 20;
        layout["bargap"] = 0.35;
        return new ChartView("Per-class precision, recall and F1", traces, layout)
        {
            Caption = "One row per class, weakest F1 at the top. Precision: of the rows predicted as the class, the share that are. Recall: of the class's rows, the share found.",
        };
    }

    /// <summary>The stacked length histogram with the <see cref="ManyClasses.StackedKept"/> largest classes in colour and the rest in one grey band.</summary>
    public static ChartView LengthHistogram(DatasetProfile p)
    {
        var centres = p.Histogram.Select(b => (b.From + b.To) / 2.0).ToArray();
        var labels = p.Histogram.Select(b => b.From == b.To ? b.From.ToString(Inv) : $"{b.From}–{b.To}").ToArray();
        double width = p.Histogram.Count == 0 ? 1 : p.Histogram[0].To - p.Histogram[0].From + 1;
        var kept = Enumerable.Range(0, p.Classes.Count).OrderByDescending(c => p.Classes[c].Rows).ThenBy(c => c).Take(ManyClasses.StackedKept).ToArray();
        var rest = Enumerable.Range(0, p.Classes.Count).Except(kept).ToArray();
        var traces = new JsonArray();
        for (int n = 0; n < kept.Length; n++)
        {
            int cls = kept[n];
            traces.Add(Band(p.Classes[cls].Name, p.Histogram.Select(b => b.RowsByClass[cls]), centres, labels, width, Theme.Colour(n)));
        }
        int restRows = rest.Sum(c => p.Classes[c].Rows);
        if (rest.Length > 0)
            traces.Add(Band($"other {rest.Length} classes", p.Histogram.Select(b => rest.Sum(c => b.RowsByClass[c])), centres, labels, width, "#C9CED6"));
        var layout = Theme.Layout($"Token lengths by class — median {Html.Num(p.Lengths.Median, 1)}, 90 % of rows at or below {Html.Num(p.Lengths.P90, 1)} tokens",
            "sequence length (tokens, before truncation)", "rows (count)", height: 400);
        layout["barmode"] = "stack";
        layout["bargap"] = 0.02;
        return new ChartView("Token length histogram", traces, layout)
        {
            Caption = $"Stacked bars: the {kept.Length} largest of {p.Classes.Count} classes in colour; the other {rest.Length} ({Html.Pct(p.Rows == 0 ? double.NaN : (double)restRows / p.Rows)} of the rows) in one grey band. The per-class table above gives every class's lengths.",
        };
    }

    /// <summary>Class shares per part as one row per class (largest class at the top), the parts' bars side by side in each row.</summary>
    public static ChartView SplitShares(SplitSummary s, IReadOnlyList<string> classNames)
    {
        int k = classNames.Count;
        var order = Enumerable.Range(0, k).OrderByDescending(c => s.Parts.Sum(p => c < p.ClassCounts.Length ? p.ClassCounts[c] : 0)).ThenBy(c => c).ToArray();
        var y = Figure.Texts(order.Select(c => classNames[c]));
        var traces = new JsonArray();
        for (int i = 0; i < s.Parts.Count; i++)
        {
            var part = s.Parts[i];
            traces.Add(new JsonObject
            {
                ["type"] = "bar", ["orientation"] = "h", ["name"] = Figure.Text(part.Part), ["y"] = y.DeepClone(),
                ["x"] = Figure.Numbers(order.Select(c => part.Proportions[c])), ["customdata"] = Figure.Numbers(order.Select(c => part.ClassCounts[c])),
                ["marker"] = new JsonObject { ["color"] = Theme.Colour(i) },
                ["hovertemplate"] = $"{Figure.Text(part.Part)} · %{{y}}<br>%{{x:.1%}} of the part (%{{customdata}} rows)<extra></extra>",
            });
        }
        var layout = Theme.Layout($"Class shares per part — the largest gap between parts is {Html.Pct(DataViews.WorstShareGap(s))} points",
            "share of the part's rows (fraction)", "class (largest first)", height: Theme.TwoLineTop + 70 + 8 * Math.Max(1, s.Parts.Count) * k);
        layout["barmode"] = "group";
        layout["bargap"] = 0.25;
        layout["xaxis"]!["tickformat"] = ".0%";
        layout["xaxis"]!["side"] = "top";
        layout["yaxis"]!["autorange"] = "reversed";
        layout["yaxis"]!["dtick"] = 1;
        layout["yaxis"]!["tickfont"] = new JsonObject { ["size"] = TickFont };
        layout["margin"]!["l"] = (int)Math.Ceiling(order.Max(c => ManyClasses.TextWidth(classNames[c], TickFont))) + 48;
        layout["margin"]!["t"] = Theme.TwoLineTop + 40;
        layout["margin"]!["b"] = 20;
        return new ChartView("Class shares per part", traces, layout) { Caption = "Bars of one class should be near level; a part that lacks a class cannot measure it." };
    }

    static JsonObject Band(string name, IEnumerable<int> rows, double[] centres, string[] labels, double width, string colour) => new()
    {
        ["type"] = "bar", ["name"] = Figure.Text(name), ["x"] = Figure.Numbers(centres), ["y"] = Figure.Numbers(rows),
        ["width"] = width * 0.95, ["customdata"] = Figure.Texts(labels), ["marker"] = new JsonObject { ["color"] = colour },
        ["hovertemplate"] = $"{Figure.Text(name)}<br>length %{{customdata}} tokens<br>%{{y}} rows<extra></extra>",
    };

    /// <summary>Classes in the order of their ECE (largest first, ties by class order): the ones the panels draw come first.</summary>
    public static int[] ByEce(CalibrationReport r) =>
        Enumerable.Range(0, r.PerClass.Count).OrderByDescending(c => double.IsNaN(r.PerClass[c].Ece) ? -1 : r.PerClass[c].Ece).ThenBy(c => c).ToArray();

    /// <summary>Every class's ECE and its share of the classwise ECE (the mean of these), largest first; the drawn panels marked.</summary>
    public static TextView ReliabilityTable(CalibrationReport r, string split = "test")
    {
        var order = ByEce(r);
        double total = r.PerClass.Sum(c => double.IsNaN(c.Ece) ? 0 : c.Ece);
        int drawn = Math.Min(ManyClasses.ReliabilityPanels, order.Length);
        var rows = order.Select((c, rank) =>
        {
            var cls = r.PerClass[c];
            int trueRows = (int)Math.Round(cls.Bins.Sum(b => b.Count == 0 ? 0 : b.Count * b.Accuracy));
            return (IReadOnlyList<string>)new[]
            {
                (rank + 1).ToString(Inv), cls.Class, Html.Pct(cls.Ece), Html.Pct(total > 0 ? cls.Ece / total : double.NaN), Html.Count(trueRows),
                rank < drawn ? "panel above" : "",
            };
        });
        return new TextView("Per-class calibration table", Html.Table(new[] { "rank", "class", "ECE", "share of classwise ECE", "true rows", "drawn" }, rows,
            $"Per-class ECE ({split} split), all {order.Length} classes, largest first; classwise ECE {Html.Pct(r.ClasswiseEce)} is their mean", textColumns: new[] { 1, 5 }));
    }

    /// <summary>The per-class reliability panels and, with many classes, the table of every class under them.</summary>
    public static IView[] Reliability(CalibrationReport r, string split = "test") => ManyClasses.Apply(r.PerClass.Count)
        ? [CalibrationViews.PerClass(r, split), ReliabilityTable(r, split)]
        : [CalibrationViews.PerClass(r, split)];

    /// <summary>The scores section's views: headline table, per-class scores, both confusion matrices and, with many classes, the confused pairs.</summary>
    public static IView[] Scores(ClassificationMetrics m, HeadlineIntervals? intervals, string split = "test")
    {
        var views = new List<IView>
        {
            MetricsViews.Summary(m, intervals, split), MetricsViews.PerClass(m, split),
            MetricsViews.Confusion(m, normalised: false), MetricsViews.Confusion(m, normalised: true),
        };
        if (ManyClasses.Apply(m.ClassNames.Count)) views.Add(ConfusedPairs(m, split: split));
        return views.ToArray();
    }
}
