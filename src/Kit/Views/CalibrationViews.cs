using System.Globalization;
using System.Text.Json.Nodes;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>
/// Reliability diagrams: observed frequency against mean confidence per bin, the diagonal of perfect
/// calibration, and the rows per bin underneath, with ECE in the title.
/// </summary>
public static class CalibrationViews
{
    /// <summary>Top-label reliability (confidence of the predicted class against the share predicted correctly).</summary>
    public static ChartView Reliability(CalibrationReport r, string split = "test")
    {
        string scheme = SchemeName(r.Scheme);
        var traces = new JsonArray
        {
            Figure.Diagonal(),
            Gaps(r.Bins, "x", "y", GapColour),
            Points(r.Bins, "observed accuracy", Theme.Colour(0), "x", "y", "confidence"),
            new JsonObject
            {
                ["type"] = "bar", ["name"] = "rows per bin", ["x"] = Figure.Numbers(r.Bins.Select(Centre)), ["y"] = Figure.Numbers(r.Bins.Select(b => b.Count)),
                ["width"] = Figure.Numbers(r.Bins.Select(b => b.Count == 0 ? double.NaN : Math.Max(0.004, (b.Hi - b.Lo) * 0.9))),
                ["xaxis"] = "x", ["yaxis"] = "y2", ["marker"] = new JsonObject { ["color"] = Theme.Colour(0), ["opacity"] = 0.35 },
                ["hovertemplate"] = "confidence %{x:.2f}<br>%{y} rows<extra></extra>",
            },
        };
        string interval = double.IsNaN(r.EceInterval.Low) ? "" : $" (95 % bootstrap {Html.Pct(r.EceInterval.Low)} – {Html.Pct(r.EceInterval.High)})";
        var layout = Theme.Layout(
            $"Top-label reliability, {scheme} bins ({split} split) — ECE {Html.Pct(r.Ece)}{interval}, MCE {Html.Pct(r.Mce)}; points below the diagonal are overconfident",
            "confidence of the predicted class (probability)", "observed accuracy (fraction correct)", height: 520);
        layout["yaxis"]!["domain"] = Figure.Pair(0.3, 1);
        AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(layout["yaxis"]!.AsObject());
        AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(layout["xaxis"]!.AsObject());
        layout["xaxis"]!["anchor"] = "y2";
        var y2 = Theme.Axis("rows (count)");
        y2["domain"] = Figure.Pair(0, 0.2);
        y2["rangemode"] = "tozero";
        layout["yaxis2"] = y2;
        return new ChartView($"Reliability ({scheme})", traces, layout)
        {
            Caption = $"{r.Bins.Count} {scheme} bins. Grey segments: each bin's gap between confidence and accuracy; ECE is their row-weighted mean, MCE the largest.",
        };
    }

    /// <summary>
    /// One small reliability panel per class: p(class) against how often the class is the true one. With many
    /// classes, panels only for the <see cref="ManyClasses.ReliabilityPanels"/> classes of largest ECE
    /// (<see cref="ManyClassViews.ReliabilityTable"/> lists them all).
    /// </summary>
    public static ChartView PerClass(CalibrationReport r, string split = "test")
    {
        bool many = ManyClasses.Apply(r.PerClass.Count);
        int[] shown = many ? ManyClassViews.ByEce(r).Take(ManyClasses.ReliabilityPanels).ToArray() : Enumerable.Range(0, r.PerClass.Count).ToArray();
        int k = shown.Length;
        // Rows need room for the x titles of one row plus the panel titles of the next.
        const double gapX = 0.06, gapY = 0.2;
        // As many columns (up to four) as leave each panel title room on one line, so titles never run into each other.
        double titleWidth = shown.Select(c => PanelTitleWidth(r.PerClass[c])).DefaultIfEmpty(0).Max();
        int cols = Math.Max(1, Math.Min(4, k));
        while (cols > 1 && (1 - gapX * (cols - 1)) / cols * PanelsPlotWidth < titleWidth) cols--;
        int rows = (k + cols - 1) / cols;
        double w = (1 - gapX * (cols - 1)) / cols, h = (1 - gapY * (rows - 1)) / rows;
        var traces = new JsonArray();
        string reading = many
            ? $"the {k} classes of largest ECE (of {r.PerClass.Count}); classwise ECE {Html.Pct(r.ClasswiseEce)}, the table below lists every class"
            : $"classwise ECE {Html.Pct(r.ClasswiseEce)}; each panel's title gives that class's ECE";
        var layout = Theme.Layout($"Per-class reliability ({split} split) — {reading}", "", "", height: 130 + 290 * rows);
        layout.Remove("xaxis");
        layout.Remove("yaxis");
        layout["showlegend"] = false;
        layout["margin"]!["t"] = Theme.TwoLineTop + 26;   // the top row's panel titles sit between the chart title and the panels
        var notes = new JsonArray();
        for (int n = 0; n < k; n++)
        {
            int c = shown[n];
            int row = n / cols, col = n % cols;
            string suffix = n == 0 ? "" : (n + 1).ToString(CultureInfo.InvariantCulture);
            string xa = "x" + suffix, ya = "y" + suffix;
            double x0 = col * (w + gapX), y1 = 1 - row * (h + gapY);
            var xAxis = Theme.Axis("predicted p (probability)");
            xAxis["domain"] = Figure.Pair(x0, x0 + w);
            AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(xAxis);
            xAxis["anchor"] = ya;
            xAxis["title"]!["font"] = new JsonObject { ["size"] = 10 };
            var yAxis = Theme.Axis("observed frequency (fraction)");
            yAxis["domain"] = Figure.Pair(y1 - h, y1);
            AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(yAxis);
            yAxis["anchor"] = xa;
            yAxis["title"]!["font"] = new JsonObject { ["size"] = 10 };
            layout["xaxis" + suffix] = xAxis;
            layout["yaxis" + suffix] = yAxis;
            var cls = r.PerClass[c];
            traces.Add(Figure.Diagonal(xa, ya, showLegend: false));
            traces.Add(Gaps(cls.Bins, xa, ya, GapColour));
            traces.Add(Points(cls.Bins, cls.Class, Theme.Colour(n), xa, ya, "p(" + cls.Class + ")"));
            notes.Add(new JsonObject
            {
                ["text"] = $"<b>{Figure.Text(cls.Class)}</b> · ECE {Html.Pct(cls.Ece)}", ["showarrow"] = false,
                ["xref"] = "paper", ["yref"] = "paper", ["x"] = x0, ["y"] = y1 + 0.01, ["xanchor"] = "left", ["yanchor"] = "bottom",
                ["font"] = new JsonObject { ["size"] = 12 },
            });
        }
        layout["annotations"] = notes;
        return new ChartView("Per-class reliability", traces, layout)
        {
            Caption = "For each class, rows are binned by the probability given to that class; the y value is the share of the bin whose true class it is.",
        };
    }

    /// <summary>The temperature report drawn from the before/after calibration it carries.</summary>
    public static StackView Temperature(TemperatureReport t, string split = "test") =>
        Temperature(t, t.Before ?? throw new ArgumentException("this temperature report carries no calibration before scaling", nameof(t)),
            t.After ?? throw new ArgumentException("this temperature report carries no calibration after scaling", nameof(t)), split);

    /// <summary>Before and after dividing the logits by the temperature fitted on validation, on the same test rows.</summary>
    public static StackView Temperature(TemperatureReport t, CalibrationReport before, CalibrationReport after, string split = "test")
    {
        var traces = new JsonArray
        {
            Figure.Diagonal(),
            Points(before.Bins, "before scaling (T = 1)", Theme.Colour(1), "x", "y", "confidence", dash: "dot"),
            Points(after.Bins, $"after scaling (T = {Html.Num(t.Temperature, 2)})", Theme.Colour(0), "x", "y", "confidence"),
        };
        string bound = t.AtSearchBound ? " (at the search bound: the fit did not settle)" : "";
        var layout = Theme.Layout(
            $"Temperature scaling, fitted on validation: T = {Html.Num(t.Temperature, 2)}{bound} — {split} ECE {Html.Pct(t.TestEceBefore)} → {Html.Pct(t.TestEceAfter)}, NLL {Html.Num(t.TestNllBefore)} → {Html.Num(t.TestNllAfter)} nats",
            "confidence of the predicted class (probability)", "observed accuracy (fraction correct)", height: 460);
        AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(layout["xaxis"]!.AsObject());
        AxisTicks.For(0, 1, RateFormat.Fraction).ApplyTo(layout["yaxis"]!.AsObject());
        var chart = new ChartView("Temperature scaling", traces, layout)
        {
            Caption = $"T > 1 softens overconfident scores, T < 1 sharpens underconfident ones. Accuracy is unchanged ({Html.Pct(t.TestAccuracy)}): dividing logits by T keeps their order.",
        };
        string table = Html.Table(new[] { "measure", "before", "after" }, new[]
        {
            new[] { "validation NLL (nats)", Html.Num(t.ValidationNllBefore), Html.Num(t.ValidationNllAfter) },
            new[] { $"{split} NLL (nats)", Html.Num(t.TestNllBefore), Html.Num(t.TestNllAfter) },
            new[] { $"{split} ECE ({t.Bins} equal-width bins)", Html.Pct(t.TestEceBefore), Html.Pct(t.TestEceAfter) },
            new[] { $"{split} classwise ECE", Html.Pct(before.ClasswiseEce), Html.Pct(after.ClasswiseEce) },
        }, "Before and after temperature scaling");
        return new StackView("Temperature scaling", new IView[] { chart, new TextView("", table) });
    }

    /// <summary>The plot width the panel layout assumes: the report's column less the chart's side margins.</summary>
    const double PanelsPlotWidth = 880;

    static double PanelTitleWidth(ClassReliability c) => ManyClasses.TextWidth($"{c.Class} · ECE {Html.Pct(c.Ece)}", 12) * 1.1;   // bold runs wider

    /// <summary>Neutral, so a gap never reads as one of the class colours in the small multiples.</summary>
    const string GapColour = "rgba(31,41,51,0.45)";

    static string SchemeName(BinningScheme s) => s == BinningScheme.EqualMass ? "equal-mass" : "equal-width";

    static double Centre(ReliabilityBin b) => b.Count == 0 ? double.NaN : (b.Lo + b.Hi) / 2;

    static JsonObject Points(IReadOnlyList<ReliabilityBin> bins, string name, string colour, string xa, string ya, string what, string dash = "solid")
    {
        int max = Math.Max(1, bins.Max(b => b.Count));
        return new JsonObject
        {
            ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = Figure.Text(name), ["xaxis"] = xa, ["yaxis"] = ya,
            ["x"] = Figure.Numbers(bins.Where(b => b.Count > 0).Select(b => b.MeanConfidence)),
            ["y"] = Figure.Numbers(bins.Where(b => b.Count > 0).Select(b => b.Accuracy)),
            ["customdata"] = Figure.Numbers(bins.Where(b => b.Count > 0).Select(b => b.Count)),
            // Marker area follows the bin's share of rows, so a lone point in a near-empty bin looks as weak as it is.
            ["marker"] = new JsonObject
            {
                ["color"] = colour, ["sizemode"] = "area", ["sizeref"] = max / 140.0, ["sizemin"] = 3,
                ["size"] = Figure.Numbers(bins.Where(b => b.Count > 0).Select(b => b.Count)),
            },
            ["line"] = Figure.Line(colour, 1.5, dash),
            ["hovertemplate"] = $"mean {Figure.Text(what)} %{{x:.3f}}<br>observed %{{y:.3f}}<br>%{{customdata}} rows<extra>{Figure.Text(name)}</extra>",
        };
    }

    /// <summary>Vertical segments from each bin's point to the diagonal, as one trace (null breaks between segments).</summary>
    static JsonObject Gaps(IReadOnlyList<ReliabilityBin> bins, string xa, string ya, string colour)
    {
        var x = new List<double>();
        var y = new List<double>();
        foreach (var b in bins.Where(b => b.Count > 0))
        {
            x.AddRange(new[] { b.MeanConfidence, b.MeanConfidence, double.NaN });
            y.AddRange(new[] { b.MeanConfidence, b.Accuracy, double.NaN });
        }
        return new JsonObject
        {
            ["type"] = "scatter", ["mode"] = "lines", ["name"] = "gap to the diagonal", ["xaxis"] = xa, ["yaxis"] = ya,
            ["x"] = Figure.Numbers(x), ["y"] = Figure.Numbers(y), ["connectgaps"] = false, ["hoverinfo"] = "skip", ["showlegend"] = xa == "x",
            ["line"] = Figure.Line(colour, 2),
        };
    }
}
