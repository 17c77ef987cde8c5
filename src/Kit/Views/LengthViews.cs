using System.Text.Json.Nodes;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>Scores by sequence length: accuracy with its Wilson band and the rows behind each bin, and recall per class × bin.</summary>
public static class LengthViews
{
    public static ChartView Accuracy(LengthBreakdown b, string unit = "tokens")
    {
        var bins = Figure.Texts(b.Rows.Select(r => r.Bin));
        var traces = new JsonArray
        {
            new JsonObject
            {
                ["type"] = "bar", ["name"] = "rows in bin", ["x"] = bins.DeepClone(), ["y"] = Figure.Numbers(b.Rows.Select(r => r.Count)), ["yaxis"] = "y",
                ["marker"] = new JsonObject { ["color"] = Theme.Grid }, ["hovertemplate"] = "%{x}: %{y} rows<extra></extra>",
            },
            // The band is drawn as upper bound, then lower bound filled up to it.
            new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines", ["name"] = "95 % Wilson interval", ["x"] = bins.DeepClone(),
                ["y"] = Figure.Numbers(b.Rows.Select(r => r.Count == 0 ? double.NaN : r.WilsonHigh)),
                ["line"] = new JsonObject { ["width"] = 0, ["color"] = Theme.Colour(0) }, ["hoverinfo"] = "skip", ["showlegend"] = false, ["legendgroup"] = "band", ["yaxis"] = "y2",
            },
            new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines", ["name"] = "95 % Wilson interval", ["x"] = bins.DeepClone(),
                ["y"] = Figure.Numbers(b.Rows.Select(r => r.Count == 0 ? double.NaN : r.WilsonLow)), ["fill"] = "tonexty",
                ["fillcolor"] = Theme.Tint(0, 0.18), ["line"] = new JsonObject { ["width"] = 0, ["color"] = Theme.Colour(0) },
                ["hoverinfo"] = "skip", ["legendgroup"] = "band", ["yaxis"] = "y2",
            },
            new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = "accuracy", ["x"] = bins.DeepClone(),
                ["y"] = Figure.Numbers(b.Rows.Select(r => r.Accuracy)), ["yaxis"] = "y2", ["line"] = Figure.Line(Theme.Colour(0)), ["marker"] = Figure.Marker(Theme.Colour(0)),
                ["customdata"] = new JsonArray(b.Rows.Select(r => (JsonNode?)Figure.Numbers(new[] { r.Correct, r.Count, r.WilsonLow, r.WilsonHigh })).ToArray()),
                ["hovertemplate"] = "%{x}<br>accuracy %{y:.1%} (%{customdata[0]} of %{customdata[1]})<br>95 % interval %{customdata[2]:.1%} – %{customdata[3]:.1%}<extra></extra>",
            },
            new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = "macro F1", ["x"] = bins.DeepClone(),
                ["y"] = Figure.Numbers(b.Rows.Select(r => r.MacroF1)), ["yaxis"] = "y2", ["line"] = Figure.Line(Theme.Colour(1), 2, "dot"), ["marker"] = Figure.Marker(Theme.Colour(1), 6),
                ["hovertemplate"] = "%{x}<br>macro F1 %{y:.3f}<extra></extra>",
            },
        };
        var filled = b.Rows.Where(r => r.Count > 0).ToArray();
        string reading = filled.Length == 0 ? "no rows"
            : $"lowest accuracy {Html.Pct(filled.Min(r => r.Accuracy))} in {filled.MinBy(r => r.Accuracy)!.Bin}, highest {Html.Pct(filled.Max(r => r.Accuracy))} in {filled.MaxBy(r => r.Accuracy)!.Bin}";
        // plotly draws an overlaying axis above its base, so the bars take the base axis (on the right) and the
        // accuracy lines the overlaying one (on the left): the lines stay on top of the bars.
        var layout = Theme.Layout($"Accuracy by {b.Attribute.ToLowerInvariant()} — {reading}", $"{b.Attribute.ToLowerInvariant()} bin ({unit})", "rows in bin (count)", height: 420);
        layout["yaxis"]!["side"] = "right";
        layout["yaxis"]!["showgrid"] = false;
        // Bars stay in the lower third so they never hide the accuracy line.
        layout["yaxis"]!["range"] = Figure.Pair(0, Math.Max(1, b.Rows.Max(r => r.Count)) * 3.2);
        var y2 = Theme.Axis("accuracy (fraction correct)");
        y2["overlaying"] = "y";
        y2["side"] = "left";
        AxisTicks.For(0, 1).ApplyTo(y2);
        layout["yaxis2"] = y2;
        layout["legend"] = new JsonObject { ["orientation"] = "h", ["x"] = 0.0, ["xanchor"] = "left", ["y"] = -0.26, ["yanchor"] = "top" };
        layout["margin"]!["b"] = 96;
        layout["margin"]!["r"] = 72;   // room for the right-hand axis title
        return new ChartView("Accuracy by length", traces, layout)
        {
            Caption = "Shaded: 95 % Wilson interval of the accuracy; a dip inside the band of its neighbours may be noise. Grey bars: rows per bin (right axis).",
        };
    }

    public static ChartView ClassByBin(ClassByBinTable t, string attribute = "length", string unit = "tokens")
    {
        int k = t.ClassNames.Count, bins = t.Bins.Count;
        var z = new JsonArray();
        var text = new JsonArray();
        for (int c = 0; c < k; c++)
        {
            int cls = c;
            z.Add(Figure.Numbers(Enumerable.Range(0, bins).Select(b => t.Recall(cls, b))));
            text.Add(new JsonArray(Enumerable.Range(0, bins)
                .Select(b => (JsonNode?)(t.Count[cls, b] == 0 ? "" : $"{Html.Pct(t.Recall(cls, b), 0)}<br>n={t.Count[cls, b]}")).ToArray()));
        }
        var trace = new JsonObject
        {
            ["type"] = "heatmap", ["z"] = z, ["text"] = text, ["texttemplate"] = "%{text}", ["textfont"] = new JsonObject { ["size"] = 10 },
            ["x"] = Figure.Texts(t.Bins), ["y"] = Figure.Texts(t.ClassNames), ["zmin"] = 0.0, ["zmax"] = 1.0, ["colorscale"] = Theme.SequentialScale(),
            ["hoverongaps"] = false, ["hovertemplate"] = "true class %{y}<br>bin %{x}<br>recall %{z:.1%}<extra></extra>",
            ["colorbar"] = AxisTicks.For(0, 1).ApplyToColourBar(new JsonObject { ["title"] = new JsonObject { ["text"] = "recall" } }),
        };
        var layout = Theme.Layout($"Recall per class and {attribute} bin — empty cells have no test rows; small n means a shaky rate",
            $"{attribute} bin ({unit})", "true class", height: 140 + 40 * k);
        layout["yaxis"]!["autorange"] = "reversed";
        layout["xaxis"]!["showgrid"] = false;
        layout["yaxis"]!["showgrid"] = false;
        return new ChartView($"Recall by class and {attribute}", new JsonArray(trace), layout);
    }
}
