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

    public static TextView Summary(ComparisonRecord c)
    {
        var rows = c.Configs.Select(s => (IReadOnlyList<string>)new[]
        {
            s.Config + (s.Baseline ? " (baseline)" : ""), s.Runs.ToString(Inv),
            Interval(s.Accuracy, v => Html.Pct(v)), Interval(s.MacroF1, v => Html.Num(v)),
            Interval(s.Ece, v => Html.Num(v)), Interval(s.LogLoss, v => Html.Num(v)),
            s.Parameters.ToString("N0", Inv), Html.Num(s.TrainSeconds.Mean, 1),
        });
        string table = Html.Table(["config", "runs", "accuracy", "macro F1", "ECE", "log loss", "parameters", "train s"], rows,
            "Mean ± standard deviation [95 % t interval] over seeds × folds; best config first", numericRight: false);
        string models = Html.Table(["config", "model"], c.Configs.Select(s => (IReadOnlyList<string>)new[] { s.Config, s.Model }), numericRight: false);
        return new TextView("Configs compared", table + models);
    }

    public static TextView Paired(ComparisonRecord c)
    {
        if (c.PairedTests.Count == 0) return TextView.Paragraph("Paired tests", "Only one config has finished runs; nothing to pair.");
        var rows = c.PairedTests.Select(p => (IReadOnlyList<string>)new[]
        {
            p.A, p.B, p.Seed.ToString(Inv), p.Items.ToString(Inv), $"{p.McNemar.OnlyA} / {p.McNemar.OnlyB}",
            p.McNemar.Method switch { McNemarMethod.ExactBinomial => "exact binomial", McNemarMethod.ChiSquaredCorrected => "χ² (continuity-corrected)", _ => "χ²" },
            p.McNemar.PValue < 1e-4 ? p.McNemar.PValue.ToString("0.0e+0", Inv) : Html.Num(p.McNemar.PValue, 4),
            $"{Html.Pct(p.Bootstrap.Difference, 2)} [{Html.Pct(p.Bootstrap.Low, 2)}, {Html.Pct(p.Bootstrap.High, 2)}]",
        });
        string table = Html.Table(["A (best)", "B", "seed", "items", "only A right / only B right", "McNemar", "p", "accuracy A − B [95 % paired bootstrap]"], rows,
            "Same test items for A and B (all folds joined, each item once per seed)", numericRight: false);
        string notes = c.Notes.Count == 0 ? "" : "<ul>" + string.Concat(c.Notes.Select(n => $"<li>{Html.Escape(n)}</li>")) + "</ul>";
        return new TextView("Paired tests against the best config", table + notes);
    }

    public static ChartView AccuracyByConfig(ComparisonRecord c)
    {
        var traces = new JsonArray();
        foreach (var s in c.Configs)
        {
            var a = s.Accuracy;
            var trace = new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "markers", ["name"] = s.Config,
                ["x"] = new JsonArray(a.Mean), ["y"] = new JsonArray(s.Config), ["showlegend"] = false,
                ["marker"] = new JsonObject { ["size"] = 10, ["color"] = Colour(c, s), ["symbol"] = s.Baseline ? "diamond" : "circle" },
                ["hovertemplate"] = $"{Html.Escape(s.Config)}<br>mean accuracy %{{x:.2%}}<br>{s.Runs} runs<extra></extra>",
            };
            if (a.Count > 1)
                trace["error_x"] = new JsonObject { ["type"] = "data", ["symmetric"] = false, ["array"] = new JsonArray(a.High - a.Mean), ["arrayminus"] = new JsonArray(a.Mean - a.Low), ["color"] = Colour(c, s) };
            traces.Add(trace);
        }
        var layout = Theme.Layout("Test accuracy by config — bars are 95 % intervals over seeds × folds", "accuracy", "", height: 140 + 34 * c.Configs.Count);
        layout["xaxis"]!["tickformat"] = ".0%";
        layout["yaxis"]!["autorange"] = "reversed";
        return new ChartView("Accuracy by config", traces, layout) { Caption = "Best config on top. The diamond is the n-gram naive Bayes baseline." };
    }

    public static ChartView AccuracyVsSize(ComparisonRecord c)
    {
        var traces = new JsonArray(c.Configs.Select(s => (JsonNode)new JsonObject
        {
            ["type"] = "scatter", ["mode"] = "markers+text", ["name"] = s.Config, ["text"] = new JsonArray(s.Config), ["textposition"] = "top center",
            ["x"] = new JsonArray(s.Parameters), ["y"] = new JsonArray(s.Accuracy.Mean),
            ["marker"] = new JsonObject { ["size"] = 10, ["color"] = Colour(c, s), ["symbol"] = s.Baseline ? "diamond" : "circle" },
            ["hovertemplate"] = $"{Html.Escape(s.Config)}<br>%{{x:,}} parameters<br>mean accuracy %{{y:.2%}}<extra></extra>",
        }).ToArray());
        var layout = Theme.Layout("Accuracy against size — up and to the left is better", "parameters (log scale)", "mean test accuracy");
        layout["xaxis"]!["type"] = "log";
        layout["yaxis"]!["tickformat"] = ".0%";
        layout["showlegend"] = false;
        return new ChartView("Accuracy vs parameter count", traces, layout)
        {
            Caption = "For the baseline, parameters are its stored log-probabilities (classes × distinct n-grams + priors).",
        };
    }

    public static ChartView LearningCurves(ComparisonRecord c)
    {
        var traces = new JsonArray();
        foreach (var s in c.Configs.Where(s => s.Curve.Count > 0))
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = s.Config,
                ["x"] = new JsonArray(s.Curve.Select(p => (JsonNode)p.Epoch).ToArray()),
                ["y"] = new JsonArray(s.Curve.Select(p => (JsonNode?)(double.IsFinite(p.ValidationAccuracy) ? p.ValidationAccuracy : null)).ToArray()),
                ["line"] = new JsonObject { ["color"] = Colour(c, s), ["width"] = 2 },
            });
        var layout = Theme.Layout("Learning curves — validation accuracy per epoch, mean over runs", "epoch", "validation accuracy");
        layout["yaxis"]!["tickformat"] = ".0%";
        layout["xaxis"]!["dtick"] = 1;
        return new ChartView("Learning curves", traces, layout) { Caption = "The baseline has no epochs and is not drawn." };
    }

    public static ChartView AccuracyByLength(ComparisonRecord c)
    {
        var traces = new JsonArray();
        foreach (var s in c.Configs)
        {
            var bins = s.ByLength;
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines+markers", ["name"] = s.Config,
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
                ["hovertemplate"] = $"{Html.Escape(s.Config)}<br>length %{{x}}<br>accuracy %{{y:.1%}} of %{{customdata}} items<extra></extra>",
            });
        }
        var layout = Theme.Layout("Accuracy by sequence length (tokens) — Wilson 95 % intervals on items pooled over runs", "length bin (tokens)", "accuracy");
        layout["yaxis"]!["tickformat"] = ".0%";
        layout["xaxis"]!["type"] = "category";
        return new ChartView("Accuracy by length", traces, layout);
    }

    public static ChartView CalibrationSideBySide(ComparisonRecord c)
    {
        int n = c.Configs.Count, columns = Math.Min(n, 4), rows = (n + columns - 1) / columns;
        var traces = new JsonArray();
        var layout = Theme.Layout("Calibration side by side — bars below the diagonal are over-confident", "", "", height: 80 + 260 * rows);
        layout.Remove("xaxis");
        layout.Remove("yaxis");
        layout["grid"] = new JsonObject { ["rows"] = rows, ["columns"] = columns, ["pattern"] = "independent", ["ygap"] = 0.35 };
        layout["showlegend"] = false;
        var annotations = new JsonArray();
        for (int i = 0; i < n; i++)
        {
            var s = c.Configs[i];
            string suffix = i == 0 ? "" : (i + 1).ToString(Inv);
            var bins = s.Reliability.Where(b => b.Count > 0).ToArray();
            traces.Add(new JsonObject
            {
                ["type"] = "bar", ["name"] = s.Config, ["xaxis"] = "x" + suffix, ["yaxis"] = "y" + suffix,
                ["x"] = new JsonArray(bins.Select(b => (JsonNode)((b.Lo + b.Hi) / 2)).ToArray()),
                ["y"] = new JsonArray(bins.Select(b => (JsonNode)b.Accuracy).ToArray()),
                ["width"] = new JsonArray(bins.Select(b => (JsonNode)((b.Hi - b.Lo) * 0.9)).ToArray()),
                ["customdata"] = new JsonArray(bins.Select(b => (JsonNode)b.Count).ToArray()),
                ["marker"] = new JsonObject { ["color"] = Colour(c, s) },
                ["hovertemplate"] = "confidence %{x:.2f}<br>accuracy %{y:.1%}<br>%{customdata} items<extra></extra>",
            });
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "lines", ["xaxis"] = "x" + suffix, ["yaxis"] = "y" + suffix, ["hoverinfo"] = "skip",
                ["x"] = new JsonArray(0.0, 1.0), ["y"] = new JsonArray(0.0, 1.0),
                ["line"] = new JsonObject { ["color"] = Theme.Muted, ["dash"] = "dash", ["width"] = 1 },
            });
            var x = Theme.Axis("confidence");
            x["range"] = new JsonArray(0.0, 1.0);
            var y = Theme.Axis(i % columns == 0 ? "accuracy" : "");
            y["range"] = new JsonArray(0.0, 1.0);
            layout["xaxis" + suffix] = x;
            layout["yaxis" + suffix] = y;
            annotations.Add(new JsonObject
            {
                ["text"] = $"{Html.Escape(s.Config)} · ECE {Html.Num(s.Ece.Mean)}", ["showarrow"] = false,
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
