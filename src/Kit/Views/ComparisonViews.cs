using System.Globalization;
using System.Text.Json.Nodes;
using Kit.Experiments;

namespace Kit.Views;

/// <summary>
/// Views of a <see cref="ComparisonRecord"/>: the per-config table, the paired tests, and five charts (accuracy
/// with intervals, accuracy against size, learning curves, accuracy by length, calibration side by side). Each
/// config keeps one colour across every chart; the baseline is always drawn in grey.
/// </summary>
public static class ComparisonViews
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    static string Colour(ComparisonRecord c, ConfigSummary s)
    {
        // The baselines take the palette's last colours (one each), the candidates cycle through the rest.
        var baselines = c.Configs.Where(x => x.Baseline).Select(x => x.Config).Order(StringComparer.Ordinal).ToList();
        if (s.Baseline) return Theme.Palette[^(1 + baselines.IndexOf(s.Config) % Theme.Palette.Length)];
        int i = c.Configs.Where(x => !x.Baseline).ToList().IndexOf(s);
        return Theme.Palette[i % Math.Max(1, Theme.Palette.Length - baselines.Count)];
    }

    static string Interval(SummaryStatistic s, Func<double, string> f) =>
        s.Count < 2 ? f(s.Mean) : $"{f(s.Mean)} ± {f(s.StandardDeviation)} [{f(s.Low)}, {f(s.High)}]";

    /// <summary>The verdict paragraph that opens a comparison (see <see cref="ComparisonVerdict"/>).</summary>
    public static TextView Verdict(ComparisonRecord c) =>
        new("Verdict", $"<p class=\"kit-verdict\">{Html.Escape(c.Verdict.Sentence())}</p>");

    /// <summary>What a config is, in full: its grid settings, or which baseline it is.</summary>
    static string Settings(ConfigSummary s) =>
        s.Baseline ? $"{s.Config} (n-gram baseline)"
        : s.Settings.Count == 0 ? s.Config : ConfigLabels.Describe(s.Settings);

    /// <summary>Hover text naming a config: its short label, then its full settings.</summary>
    static string Hover(ConfigSummary s) => $"<b>{Figure.Text(s.Label)}</b><br>{Figure.Text(Settings(s))}";

    public static TextView Summary(ComparisonRecord c)
    {
        var rows = c.Configs.Select(s => (IReadOnlyList<string>)new[]
        {
            s.Label, Settings(s), s.Runs.ToString(Inv),
            Interval(s.Accuracy, v => Html.Pct(v)), Interval(s.MacroF1, v => Html.Num(v)),
            Interval(s.Ece, v => Html.Num(v)), Interval(s.LogLoss, v => Html.Num(v)),
            s.Parameters.ToString("N0", Inv), Html.Num(s.TrainSeconds.Mean, 1),
        });
        string table = Html.Table(["config", "settings", "runs", "accuracy", "macro F1", "ECE", "log loss", "parameters", "train s"], rows,
            "Mean ± standard deviation [95 % t interval] over seeds × folds; best config first. Charts name each config by the settings that differ between configs.",
            numericRight: false);
        string models = Html.Table(["config", "model"], c.Configs.Select(s => (IReadOnlyList<string>)new[] { s.Label, s.Model }), numericRight: false);
        return new TextView("Configs compared", table + models);
    }

    static string MethodName(McNemarMethod m) => m switch
    {
        McNemarMethod.ExactBinomial => "exact binomial", McNemarMethod.ChiSquaredCorrected => "χ² (continuity-corrected)", _ => "χ²",
    };

    public static TextView Paired(ComparisonRecord c)
    {
        if (c.PairedTests.Count == 0) return TextView.Paragraph("Paired tests", "Only one config has finished runs; nothing to pair.");
        var labels = c.Configs.ToDictionary(s => s.Config, s => s.Label);
        var methods = c.PairedTests.Select(p => p.McNemar.Method).Distinct().ToArray();
        // One method for every row is said once, in the caption; a mix gets its own column.
        bool oneMethod = methods.Length == 1;
        var rows = c.PairedTests.Select(p =>
        {
            var row = new List<string>
            {
                labels.GetValueOrDefault(p.A, p.A), labels.GetValueOrDefault(p.B, p.B), p.Seed.ToString(Inv), p.Items.ToString(Inv),
                $"{p.McNemar.OnlyA} / {p.McNemar.OnlyB}",
            };
            if (!oneMethod) row.Add(MethodName(p.McNemar.Method));
            row.Add(p.McNemar.PValue < 1e-4 ? p.McNemar.PValue.ToString("0.0e+0", Inv) : Html.Num(p.McNemar.PValue, 4));
            row.Add($"{Html.Pct(p.Bootstrap.Difference, 2)} [{Html.Pct(p.Bootstrap.Low, 2)}, {Html.Pct(p.Bootstrap.High, 2)}]");
            return (IReadOnlyList<string>)row;
        });
        var headers = new List<string> { "A (best)", "B", "seed", "items", "only A right / only B right" };
        if (!oneMethod) headers.Add("McNemar method");
        headers.AddRange(["McNemar p", "accuracy A − B [95 % paired bootstrap]"]);
        string caption = "Same test items for A and B (all folds joined, each item once per seed)" +
            (oneMethod ? $"; McNemar's test by the {MethodName(methods[0])} method in every row" : "; McNemar's method is exact binomial below 25 discordant items");
        string table = Html.Table(headers, rows, caption, numericRight: false);
        string notes = c.Notes.Count == 0 ? "" : "<ul>" + string.Concat(c.Notes.Select(n => $"<li>{Html.Escape(n)}</li>")) + "</ul>";
        return new TextView("Paired tests against the best config", table + notes);
    }

    /// <summary>
    /// The width a comparison chart is laid out for before a browser measures anything: the report's column is
    /// about 980 px and a notebook output about 800 px; 760 px leaves a margin under both.
    /// </summary>
    public const double AssumedWidth = 760;

    static IEnumerable<double> Finite(params double[] v) => v.Where(double.IsFinite);

    public static ChartView AccuracyByConfig(ComparisonRecord c)
    {
        var traces = new JsonArray();
        foreach (var s in c.Configs)
        {
            var a = s.Accuracy;
            var trace = new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "markers", ["name"] = Figure.Text(s.Label),
                ["x"] = new JsonArray(a.Mean), ["y"] = new JsonArray(Figure.Text(s.Label)), ["showlegend"] = false,
                ["marker"] = new JsonObject { ["size"] = 10, ["color"] = Colour(c, s), ["symbol"] = s.Baseline ? "diamond" : "circle" },
                ["hovertemplate"] = $"{Hover(s)}<br>mean accuracy %{{x:.2%}}<br>{s.Runs} runs<extra></extra>",
            };
            if (a.Count > 1)
                trace["error_x"] = new JsonObject { ["type"] = "data", ["symmetric"] = false, ["array"] = new JsonArray(a.High - a.Mean), ["arrayminus"] = new JsonArray(a.Mean - a.Low), ["color"] = Colour(c, s) };
            traces.Add(trace);
        }
        var layout = Theme.Layout("Test accuracy by config — bars are 95 % intervals over seeds × folds", "accuracy", "", height: 140 + 34 * c.Configs.Count);
        AxisTicks.ForValues(c.Configs.SelectMany(s => Finite(s.Accuracy.Mean, s.Accuracy.Low, s.Accuracy.High))).ApplyTo(layout["xaxis"]!.AsObject());
        layout["yaxis"]!["autorange"] = "reversed";
        layout["margin"]!["l"] = LeftMargin(c.Configs.Select(s => s.Label), 12);
        return new ChartView("Accuracy by config", traces, layout) { Caption = "Best config on top. Diamonds are the n-gram baselines; hover a point for its full settings." };
    }

    /// <summary>Room for the longest category label at the given font size, plus the tick and a gap.</summary>
    static int LeftMargin(IEnumerable<string> labels, double fontSize) =>
        (int)Math.Ceiling(Math.Max(64, labels.Select(l => TextWidth.Pixels(l, fontSize)).DefaultIfEmpty(0).Max() + 20));

    public static ChartView AccuracyVsSize(ComparisonRecord c)
    {
        var logs = c.Configs.Select(s => Math.Log10(Math.Max(1, s.Parameters))).ToArray();
        double lo = logs.Min(), hi = logs.Max(), span = Math.Max(hi - lo, 0.5), mid = (lo + hi) / 2;
        double rangeLo = mid - span / 2 - 0.1 * span, rangeHi = mid + span / 2 + 0.1 * span;
        var layout = Theme.Layout("Accuracy against size — up and to the left is better", "parameters (log scale)", "mean test accuracy");
        layout["xaxis"]!["type"] = "log";
        AxisTicks.ApplyLogCounts(layout["xaxis"]!.AsObject(), rangeLo, rangeHi);
        // Headroom for a label above the highest point: a sixth of the data's span on top.
        var means = c.Configs.Select(s => s.Accuracy.Mean).Where(double.IsFinite).DefaultIfEmpty(0.5).ToArray();
        double top = means.Max(), bottom = means.Min();
        var yAxis = layout["yaxis"]!.AsObject();
        AxisTicks.For(bottom, top + Math.Max((top - bottom) / 6, 0.002)).ApplyTo(yAxis);
        double yLo = yAxis["range"]![0]!.GetValue<double>(), yHi = yAxis["range"]![1]!.GetValue<double>();
        var margin = layout["margin"]!;
        double plotWidth = AssumedWidth - margin["l"]!.GetValue<int>() - margin["r"]!.GetValue<int>();
        double plotHeight = layout["height"]!.GetValue<int>() - margin["t"]!.GetValue<int>() - margin["b"]!.GetValue<int>();
        var points = c.Configs.Select((s, i) => (
            X: (logs[i] - rangeLo) / (rangeHi - rangeLo) * plotWidth,
            Y: double.IsFinite(s.Accuracy.Mean) ? (yHi - s.Accuracy.Mean) / (yHi - yLo) * plotHeight : double.NaN)).ToArray();
        var placed = LabelPlacement.Place(points, c.Configs.Select(s => TextWidth.Pixels(s.Label, 12)).ToArray(), 16, plotWidth, plotHeight);

        var traces = new JsonArray();
        for (int i = 0; i < c.Configs.Count; i++)
        {
            var s = c.Configs[i];
            var trace = new JsonObject
            {
                ["type"] = "scatter", ["name"] = Figure.Text(s.Label),
                ["x"] = new JsonArray(s.Parameters), ["y"] = new JsonArray(s.Accuracy.Mean),
                ["marker"] = new JsonObject { ["size"] = 10, ["color"] = Colour(c, s), ["symbol"] = s.Baseline ? "diamond" : "circle" },
                ["hovertemplate"] = $"{Hover(s)}<br>%{{x:,}} parameters<br>mean accuracy %{{y:.2%}}<extra></extra>",
            };
            // A label goes where it overlaps no other label or point; a config with no such place is named in the legend.
            if (placed[i] is { } position)
            {
                trace["mode"] = "markers+text";
                trace["text"] = new JsonArray(Figure.Text(s.Label));
                trace["textposition"] = position;
                trace["showlegend"] = false;
            }
            else trace["mode"] = "markers";
            traces.Add(trace);
        }
        layout["showlegend"] = placed.Any(p => p is null);
        return new ChartView("Accuracy vs parameter count", traces, layout)
        {
            Caption = "For the baselines, parameters are their stored weights (classes × distinct n-grams + priors or biases)." +
                      (placed.Any(p => p is null) ? " Configs whose name found no free place beside their point are named in the legend." : ""),
        };
    }

    public static ChartView LearningCurves(ComparisonRecord c)
    {
        var traces = new JsonArray();
        foreach (var s in c.Configs.Where(s => s.Curve.Count > 0))
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = Figure.Text(s.Label),
                ["x"] = new JsonArray(s.Curve.Select(p => (JsonNode)p.Epoch).ToArray()),
                ["y"] = new JsonArray(s.Curve.Select(p => (JsonNode?)(double.IsFinite(p.ValidationAccuracy) ? p.ValidationAccuracy : null)).ToArray()),
                ["line"] = new JsonObject { ["color"] = Colour(c, s), ["width"] = 2 },
                ["hovertemplate"] = $"{Hover(s)}<br>epoch %{{x}}<br>validation accuracy %{{y:.2%}}<extra></extra>",
            });
        var layout = Theme.Layout("Learning curves — validation accuracy per epoch, mean over runs", "epoch", "validation accuracy");
        AxisTicks.ForValues(c.Configs.SelectMany(s => s.Curve.Select(p => p.ValidationAccuracy))).ApplyTo(layout["yaxis"]!.AsObject());
        layout["xaxis"]!["dtick"] = 1;
        return new ChartView("Learning curves", traces, layout) { Caption = "The baselines have no epochs and are not drawn." };
    }

    public static ChartView AccuracyByLength(ComparisonRecord c)
    {
        var traces = new JsonArray();
        foreach (var s in c.Configs)
        {
            var bins = s.ByLength;
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = Figure.Text(s.Label),
                ["x"] = new JsonArray(bins.Select(b => (JsonNode)b.Bin).ToArray()),
                ["y"] = new JsonArray(bins.Select(b => (JsonNode?)(double.IsNaN(b.Accuracy) ? null : b.Accuracy)).ToArray()),
                ["error_y"] = new JsonObject
                {
                    ["type"] = "data", ["symmetric"] = false, ["thickness"] = 1,
                    ["array"] = new JsonArray(bins.Select(b => (JsonNode?)(double.IsNaN(b.Accuracy) ? null : b.WilsonHigh - b.Accuracy)).ToArray()),
                    ["arrayminus"] = new JsonArray(bins.Select(b => (JsonNode?)(double.IsNaN(b.Accuracy) ? null : b.Accuracy - b.WilsonLow)).ToArray()),
                },
                ["line"] = new JsonObject { ["color"] = Colour(c, s), ["width"] = 2, ["dash"] = s.Baseline ? "dot" : "solid" },
                ["customdata"] = new JsonArray(bins.Select(b => (JsonNode)b.Count).ToArray()),
                ["hovertemplate"] = $"{Hover(s)}<br>length %{{x}}<br>accuracy %{{y:.1%}} of %{{customdata}} items<extra></extra>",
            });
        }
        var layout = Theme.Layout("Accuracy by sequence length (tokens) — Wilson 95 % intervals on items pooled over runs", "length bin (tokens)", "accuracy");
        AxisTicks.ForValues(c.Configs.SelectMany(s => s.ByLength.Where(b => !double.IsNaN(b.Accuracy)).SelectMany(b => Finite(b.WilsonLow, b.WilsonHigh))))
            .ApplyTo(layout["yaxis"]!.AsObject());
        layout["xaxis"]!["type"] = "category";
        return new ChartView("Accuracy by length", traces, layout);
    }

    /// <summary>
    /// Panels per row for the calibration small multiples: the most (up to four) whose titles each fit within a
    /// panel and the gap after it (the grid's xgap, 0.12 of a column) at the assumed width, so titles never run into
    /// the next panel's.
    /// </summary>
    internal static int CalibrationColumns(IReadOnlyList<string> titles, double width = AssumedWidth, double titleFont = 11)
    {
        double plot = width - 64 - 24, widest = titles.Select(t => TextWidth.Pixels(t, titleFont)).DefaultIfEmpty(0).Max();
        for (int columns = Math.Min(4, Math.Max(1, titles.Count)); columns > 1; columns--)
            if (widest <= plot / columns - 8) return columns;   // a column's domain plus its share of the gap, less a little air
        return 1;
    }

    public static ChartView CalibrationSideBySide(ComparisonRecord c)
    {
        int n = c.Configs.Count;
        var titles = c.Configs.Select(s => $"{s.Label} · ECE {Html.Num(s.Ece.Mean)}").ToArray();
        int columns = CalibrationColumns(titles), rows = (n + columns - 1) / columns;
        var traces = new JsonArray();
        var layout = Theme.Layout("Calibration side by side — bars below the diagonal are over-confident", "", "", height: 80 + 260 * rows);
        layout.Remove("xaxis");
        layout.Remove("yaxis");
        layout["grid"] = new JsonObject { ["rows"] = rows, ["columns"] = columns, ["pattern"] = "independent", ["ygap"] = 0.35, ["xgap"] = 0.12 };
        layout["showlegend"] = false;
        layout["margin"]!["t"] = Theme.TwoLineTop + 16;   // the first row's panel titles sit above its plots
        var ticks = AxisTicks.For(0, 1, RateFormat.Fraction);
        var annotations = new JsonArray();
        for (int i = 0; i < n; i++)
        {
            var s = c.Configs[i];
            string suffix = i == 0 ? "" : (i + 1).ToString(Inv);
            var bins = s.Reliability.Where(b => b.Count > 0).ToArray();
            traces.Add(new JsonObject
            {
                ["type"] = "bar", ["name"] = Figure.Text(s.Label), ["xaxis"] = "x" + suffix, ["yaxis"] = "y" + suffix,
                ["x"] = new JsonArray(bins.Select(b => (JsonNode)((b.Lo + b.Hi) / 2)).ToArray()),
                ["y"] = new JsonArray(bins.Select(b => (JsonNode)b.Accuracy).ToArray()),
                ["width"] = new JsonArray(bins.Select(b => (JsonNode)((b.Hi - b.Lo) * 0.9)).ToArray()),
                ["customdata"] = new JsonArray(bins.Select(b => (JsonNode)b.Count).ToArray()),
                ["marker"] = new JsonObject { ["color"] = Colour(c, s) },
                ["hovertemplate"] = $"{Hover(s)}<br>confidence %{{x:.2f}}<br>accuracy %{{y:.1%}}<br>%{{customdata}} items<extra></extra>",
            });
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines", ["xaxis"] = "x" + suffix, ["yaxis"] = "y" + suffix, ["hoverinfo"] = "skip",
                ["x"] = new JsonArray(0.0, 1.0), ["y"] = new JsonArray(0.0, 1.0),
                ["line"] = new JsonObject { ["color"] = Theme.Muted, ["dash"] = "dash", ["width"] = 1 },
            });
            layout["xaxis" + suffix] = ticks.ApplyTo(Theme.Axis("confidence"));
            layout["yaxis" + suffix] = ticks.ApplyTo(Theme.Axis(i % columns == 0 ? "accuracy" : ""));
            annotations.Add(new JsonObject
            {
                ["text"] = Figure.Text(titles[i]), ["showarrow"] = false, ["hovertext"] = Figure.Text(Settings(s)),
                ["xref"] = $"x{suffix} domain", ["yref"] = $"y{suffix} domain", ["x"] = 0.0, ["y"] = 1.12, ["xanchor"] = "left",
                ["font"] = new JsonObject { ["size"] = 11 },
            });
        }
        layout["annotations"] = annotations;
        return new ChartView("Calibration by config", traces, layout)
        {
            Caption = "Top-label reliability: test items pooled over runs into equal-width confidence bins; ECE is the mean over runs.",
        };
    }
}
