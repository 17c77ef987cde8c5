using System.Text.Json.Nodes;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>Headline metrics, the per-class table and the confusion matrix heat maps.</summary>
public static class MetricsViews
{
    public static TextView Summary(ClassificationMetrics m, string split = "test") => Summary(m, null, split);

    /// <summary>As above, with 95 % intervals beside accuracy and macro F1 when <paramref name="intervals"/> is given.</summary>
    public static TextView Summary(ClassificationMetrics m, HeadlineIntervals? intervals, string split = "test")
    {
        string accuracyInterval = "", macroInterval = "";
        if (intervals is not null)
        {
            accuracyInterval = $"{Html.Pct(intervals.AccuracyLow)} – {Html.Pct(intervals.AccuracyHigh)}";
            macroInterval = $"{Html.Num(intervals.MacroF1Low)} – {Html.Num(intervals.MacroF1High)}";
        }
        var rows = new List<string[]>
        {
            new[] { "accuracy", Html.Pct(m.Accuracy), accuracyInterval },
            new[] { "balanced accuracy", Html.Pct(m.BalancedAccuracy), "" },
            new[] { "macro F1", Html.Num(m.MacroF1), macroInterval },
            new[] { "weighted F1", Html.Num(m.WeightedF1), "" },
            new[] { "log loss (nats)", Html.Num(m.LogLoss), "" },
            new[] { "Brier score", Html.Num(m.Brier), "" },
        };
        var header = new List<string> { "metric", split, "95 % interval" };
        string caption = $"Headline metrics on the {split} split";
        if (intervals is null)
        {
            header.RemoveAt(2);
            rows = rows.Select(r => r[..2]).ToList();
        }
        else caption += $"; intervals: Wilson for accuracy, bootstrap of {intervals.Replicates} resamples for macro F1 (the test sample's uncertainty, not the spread between seeds)";
        string headline = Html.Table(header, rows, caption);
        string perClass = Html.Table(new[] { "class", "precision", "recall", "F1", "true rows", "predicted rows" },
            m.PerClass.Select(c => (IReadOnlyList<string>)new[] { c.Class, Html.Num(c.Precision), Html.Num(c.Recall), Html.Num(c.F1), c.TrueRows.ToString(), c.PredictedRows.ToString() }),
            "Per class", textColumns: new[] { 0 });
        return new TextView($"Metrics ({split} split)", headline + perClass);
    }

    /// <summary>Precision, recall and F1 side by side per class, the class's true rows in the tick label.</summary>
    public static ChartView PerClass(ClassificationMetrics m, string split = "test")
    {
        if (ManyClasses.Apply(m.ClassNames.Count)) return ManyClassViews.PerClass(m, split);
        var ticks = Figure.Texts(m.PerClass.Select(c => $"{c.Class} (n={c.TrueRows})"));
        var traces = new JsonArray();
        var series = new (string Name, Func<ClassScores, double> Get)[] { ("precision", c => c.Precision), ("recall", c => c.Recall), ("F1", c => c.F1) };
        for (int i = 0; i < series.Length; i++)
        {
            var (name, get) = series[i];
            traces.Add(new JsonObject
            {
                ["type"] = "bar", ["name"] = name, ["x"] = ticks.DeepClone(), ["y"] = Figure.Numbers(m.PerClass.Select(get)),
                ["marker"] = new JsonObject { ["color"] = Theme.Colour(i) },
                ["hovertemplate"] = $"%{{x}}<br>{name} %{{y:.3f}}<extra></extra>",
            });
        }
        var weakest = m.PerClass.Where(c => c.TrueRows > 0).OrderBy(c => c.F1).FirstOrDefault();
        string title = weakest is null ? $"Per-class scores ({split} split)"
            : $"Per-class scores ({split} split) — weakest class by F1: {weakest.Class} ({Html.Num(weakest.F1)})";
        var layout = Theme.Layout(title, "class (test rows in brackets)", "score (0 to 1)", height: 420);
        layout["barmode"] = "group";
        AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(layout["yaxis"]!.AsObject());
        layout["xaxis"]!["tickangle"] = -30;
        return new ChartView("Per-class precision, recall and F1", traces, layout)
        {
            Caption = "Precision: of the rows predicted as the class, the share that are. Recall: of the class's rows, the share found.",
        };
    }

    /// <summary>The confusion heat map; with many classes in clustered order with sparse numbers (<see cref="ManyClassViews.Confusion"/>).</summary>
    public static ChartView Confusion(ClassificationMetrics m, bool normalised)
    {
        if (ManyClasses.Apply(m.ClassNames.Count)) return ManyClassViews.Confusion(m, normalised);
        var names = m.ClassNames;
        int k = names.Count;
        var z = new JsonArray();
        var text = new JsonArray();
        for (int i = 0; i < k; i++)
        {
            var row = new JsonArray();
            var trow = new JsonArray();
            for (int j = 0; j < k; j++)
            {
                double v = normalised ? m.ConfusionNormalised[i, j] : m.Confusion[i, j];
                row.Add(v);
                trow.Add(normalised ? Html.Pct(v, 0) : m.Confusion[i, j].ToString());
            }
            z.Add(row);
            text.Add(trow);
        }
        var trace = new JsonObject
        {
            ["type"] = "heatmap", ["z"] = z, ["text"] = text, ["texttemplate"] = "%{text}",
            ["x"] = Figure.Texts(names), ["y"] = Figure.Texts(names),
            ["colorscale"] = Theme.SequentialScale(), ["showscale"] = true,
            ["hovertemplate"] = normalised ? "true %{y}<br>predicted %{x}<br>%{z:.1%} of the true class<extra></extra>" : "true %{y}<br>predicted %{x}<br>%{z} rows<extra></extra>",
            ["colorbar"] = new JsonObject { ["title"] = new JsonObject { ["text"] = normalised ? "share of row" : "rows" } },
        };
        if (normalised) { trace["zmin"] = 0.0; trace["zmax"] = 1.0; }
        string title = normalised
            ? "Confusion matrix, row-normalised — the diagonal is each class's recall"
            : "Confusion matrix, counts — off-diagonal cells are the mistakes";
        var layout = Theme.Layout(title, "predicted class", "true class", height: 120 + 46 * k);
        layout["yaxis"]!["autorange"] = "reversed";
        layout["xaxis"]!["tickangle"] = -30;
        layout["xaxis"]!["showgrid"] = false;
        layout["yaxis"]!["showgrid"] = false;
        return new ChartView(normalised ? "Confusion matrix (normalised)" : "Confusion matrix (counts)", new JsonArray(trace), layout);
    }
}
