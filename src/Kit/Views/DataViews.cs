using System.Globalization;
using System.Text;
using System.Text.Json.Nodes;
using Kit.Data;

namespace Kit.Views;

/// <summary>The data before any model: class balance and lengths, how the split came out, what the leakage audit found.</summary>
public static class DataViews
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static StackView Profile(DatasetProfile p)
    {
        var c = p.Coverage;
        string overview = Html.Table(new[] { "item", "value" }, new[]
        {
            new[] { "rows", p.Rows.ToString("N0", Inv) },
            new[] { "classes", $"{p.Classes.Count} (largest / smallest = {Html.Num(p.ImbalanceRatio, 1)})" },
            new[] { "tokenizer", p.Tokenizer },
            new[] { "token length", $"min {p.Lengths.Min}, median {Html.Num(p.Lengths.Median, 1)}, 90th pct {Html.Num(p.Lengths.P90, 1)}, max {p.Lengths.Max}" },
            new[] { "token types", $"{c.Types.ToString("N0", Inv)} distinct in {c.Occurrences.ToString("N0", Inv)} occurrences; {c.Singletons.ToString("N0", Inv)} occur once" },
            new[] { "coverage", $"the {Html.Count(c.TypesFor90)} / {Html.Count(c.TypesFor95)} / {Html.Count(c.TypesFor99)} most frequent types cover 90 / 95 / 99 % of occurrences" },
        }, "Overview", numericRight: false);
        string perClass = Html.Table(new[] { "class", "rows", "share", "min length", "median", "90th pct", "max" },
            p.Classes.Select(k => (IReadOnlyList<string>)new[]
            {
                k.Name, k.Rows.ToString("N0", Inv), Html.Pct(k.Proportion), k.Lengths.Min.ToString(Inv), Html.Num(k.Lengths.Median, 1),
                Html.Num(k.Lengths.P90, 1), k.Lengths.Max.ToString(Inv),
            }), "Per class (token lengths before truncation)", textColumns: new[] { 0 });
        return new StackView("Dataset profile", new IView[] { new TextView("", overview + perClass), ClassBalance(p), LengthHistogram(p) });
    }

    public static ChartView ClassBalance(DatasetProfile p)
    {
        var ordered = p.Classes.OrderBy(k => k.Rows).ToArray();   // largest at the top of a horizontal bar chart
        var trace = new JsonObject
        {
            ["type"] = "bar", ["orientation"] = "h", ["name"] = "rows",
            ["x"] = Figure.Numbers(ordered.Select(k => k.Rows)), ["y"] = Figure.Texts(ordered.Select(k => k.Name)),
            ["text"] = Figure.Texts(ordered.Select(k => Html.Pct(k.Proportion))), ["textposition"] = "outside", ["cliponaxis"] = false,
            ["marker"] = new JsonObject { ["color"] = Theme.Colour(0) },
            ["hovertemplate"] = "%{y}: %{x} rows (%{text})<extra></extra>",
        };
        var layout = Theme.Layout($"Class balance — largest class has {Html.Num(p.ImbalanceRatio, 1)}× the rows of the smallest", "rows (count)", "class",
            height: 110 + 30 * ordered.Length);
        layout["showlegend"] = false;
        layout["margin"]!["r"] = 60;
        return new ChartView("Class balance", new JsonArray(trace), layout);
    }

    public static ChartView LengthHistogram(DatasetProfile p)
    {
        if (ManyClasses.Apply(p.Classes.Count)) return ManyClassViews.LengthHistogram(p);
        var traces = new JsonArray();
        var centres = p.Histogram.Select(b => (b.From + b.To) / 2.0).ToArray();
        var labels = p.Histogram.Select(b => b.From == b.To ? b.From.ToString(Inv) : $"{b.From}–{b.To}").ToArray();
        double width = p.Histogram.Count == 0 ? 1 : p.Histogram[0].To - p.Histogram[0].From + 1;
        for (int k = 0; k < p.Classes.Count; k++)
        {
            int cls = k;
            traces.Add(new JsonObject
            {
                ["type"] = "bar", ["name"] = Figure.Text(p.Classes[k].Name),
                ["x"] = Figure.Numbers(centres), ["y"] = Figure.Numbers(p.Histogram.Select(b => b.RowsByClass[cls])),
                ["width"] = width * 0.95, ["customdata"] = Figure.Texts(labels),
                ["marker"] = new JsonObject { ["color"] = Theme.Colour(k) },
                ["hovertemplate"] = $"{Figure.Text(p.Classes[k].Name)}<br>length %{{customdata}} tokens<br>%{{y}} rows<extra></extra>",
            });
        }
        var layout = Theme.Layout($"Token lengths by class — median {Html.Num(p.Lengths.Median, 1)}, 90 % of rows at or below {Html.Num(p.Lengths.P90, 1)} tokens",
            "sequence length (tokens, before truncation)", "rows (count)", height: 400);
        layout["barmode"] = "stack";
        layout["bargap"] = 0.02;
        return new ChartView("Token length histogram", traces, layout) { Caption = "Stacked bars: each colour is one class." };
    }

    /// <summary>The split drawn with the class names it carries (class ids when it carries none).</summary>
    public static StackView Split(SplitSummary s) =>
        Split(s, s.ClassNames ?? Enumerable.Range(0, s.Parts.Count == 0 ? 0 : s.Parts[0].ClassCounts.Length).Select(c => c.ToString(Inv)).ToArray());

    public static StackView Split(SplitSummary s, IReadOnlyList<string> classNames)
    {
        string table = Html.Table(new[] { "part", "rows", "share of rows", "median length", "90th pct length", "max length" },
            s.Parts.Select(p => (IReadOnlyList<string>)new[]
            {
                p.Part, p.Rows.ToString("N0", Inv), Html.Pct(s.Rows == 0 ? double.NaN : (double)p.Rows / s.Rows),
                Html.Num(p.Lengths.Median, 1), Html.Num(p.Lengths.P90, 1), p.Lengths.Count == 0 ? "–" : p.Lengths.Max.ToString(Inv),
            }), $"{s.Method}, seed {s.Seed}");
        if (ManyClasses.Apply(classNames.Count)) return new StackView("Split summary", new IView[] { new TextView("", table), ManyClassViews.SplitShares(s, classNames) });
        var traces = new JsonArray();
        for (int i = 0; i < s.Parts.Count; i++)
        {
            var part = s.Parts[i];
            traces.Add(new JsonObject
            {
                ["type"] = "bar", ["name"] = Figure.Text(part.Part),
                ["x"] = Figure.Texts(classNames), ["y"] = Figure.Numbers(part.Proportions),
                ["customdata"] = Figure.Numbers(part.ClassCounts),
                ["marker"] = new JsonObject { ["color"] = Theme.Colour(i) },
                ["hovertemplate"] = $"{Figure.Text(part.Part)} · %{{x}}<br>%{{y:.1%}} of the part (%{{customdata}} rows)<extra></extra>",
            });
        }
        double worst = WorstShareGap(s);
        var layout = Theme.Layout($"Class shares per part — the largest gap between parts is {Html.Pct(worst)} points",
            "class", "share of the part's rows (fraction)", height: 400);
        layout["barmode"] = "group";
        AxisTicks.ForValues(s.Parts.SelectMany(p => p.Proportions).Append(0)).ApplyTo(layout["yaxis"]!.AsObject());
        layout["xaxis"]!["tickangle"] = -30;
        var chart = new ChartView("Class shares per part", traces, layout) { Caption = "Bars of one class should be near level; a part that lacks a class cannot measure it." };
        return new StackView("Split summary", new IView[] { new TextView("", table), chart });
    }

    /// <summary>Largest difference, over classes, between the highest and lowest share any part gives that class.</summary>
    internal static double WorstShareGap(SplitSummary s)
    {
        var parts = s.Parts.Where(p => p.Rows > 0).ToArray();
        if (parts.Length < 2) return 0;
        int k = parts.Min(p => p.Proportions.Length);
        return Enumerable.Range(0, k).Select(c => parts.Max(p => p.Proportions[c]) - parts.Min(p => p.Proportions[c])).DefaultIfEmpty(0).Max();
    }

    public static TextView Leakage(LeakageReport r)
    {
        var sb = new StringBuilder();
        sb.Append(r.Clean
            ? "<p class=\"kit-ok\">Nothing found: no text or group of the training part reappears in validation or test, and no text carries two labels.</p>"
            : "<p class=\"kit-warn\">The audit found rows that can flatter the scores; read the examples before trusting the test figures.</p>");
        sb.Append(Html.Table(new[] { "finding", "distinct texts or groups", "rows affected" },
            r.Findings.Select(f => (IReadOnlyList<string>)new[] { f.Kind, f.Texts.ToString("N0", Inv), f.Rows.ToString("N0", Inv) }),
            $"Leakage audit over {Html.Count(r.Rows)} rows"));
        var examples = r.Findings.SelectMany(f => f.Examples.Select(e => (IReadOnlyList<string>)new[] { f.Kind, e.Text, e.Detail, string.Join(" ", e.Lines) })).ToArray();
        if (examples.Length > 0)
            sb.Append(Html.Table(new[] { "finding", "text", "detail", "source lines" }, examples, "Examples", numericRight: false));
        return new TextView("Leakage audit", sb.ToString());
    }

    /// <summary>How a vocabulary covers one part (or any rows it was measured on).</summary>
    public static TextView Coverage(VocabularyCoverage v) => new($"Vocabulary coverage — {(v.Part.Length == 0 ? "rows" : v.Part)}",
        Html.Table(new[] { "tokens", "unknown tokens", "unknown rate", "distinct types", "unknown types" }, new[]
        {
            new[] { v.Tokens.ToString("N0", Inv), v.UnknownTokens.ToString("N0", Inv), Html.Pct(v.UnknownRate, 2), v.Types.ToString("N0", Inv), v.UnknownTypes.ToString("N0", Inv) },
        }));

    /// <summary>
    /// Prepared data at a glance: what was prepared and how, then the profile, the split, the leakage audit and the
    /// encoding of its first fold (every fold of a k-fold split has its own; <c>data.Fold(k)</c> shows another).
    /// </summary>
    public static StackView Prepared(PreparedData d)
    {
        var fold = d.Fold(1);
        string summary = Html.Table(new[] { "item", "value" }, new[]
        {
            new[] { "source", $"{Path.GetFileName(d.Table.SourcePath)} — {d.Count.ToString("N0", Inv)} rows in play of {d.Table.Count.ToString("N0", Inv)}, {d.Labels.Count} classes" },
            new[] { "split", d.SplitDescription + (d.FoldCount > 1 ? $" (shown: fold 1 of {d.FoldCount})" : "") },
            new[] { "parts", $"train {fold.Split.Train.Length.ToString("N0", Inv)} · validation {fold.Split.Validation.Length.ToString("N0", Inv)} · test {fold.Split.Test.Length.ToString("N0", Inv)}" },
            new[] { "tokens", $"{d.Tokenizer.Name}; vocabulary of {fold.Vocabulary.Count.ToString("N0", Inv)} ids from the training part only; max length {d.Options.MaxLength}" },
        }, numericRight: false);
        return new StackView("Prepared data", new IView[]
        {
            new TextView("", summary), Profile(d.Profile), Split(fold.Summary), Leakage(fold.Leakage), Encoding(fold.Coverage, fold.Truncation),
        });
    }

    /// <summary>One fold of prepared data: its split, audit and encoding.</summary>
    public static StackView Fold(PreparedFold f) => new($"Fold {f.Number} of {f.Data.FoldCount}", new IView[]
    {
        Split(f.Summary), Leakage(f.Leakage), Encoding(f.Coverage, f.Truncation),
    });

    public static TextView Encoding(IReadOnlyList<VocabularyCoverage> coverage, TruncationReport truncation)
    {
        string cov = Html.Table(new[] { "part", "tokens", "unknown tokens", "unknown rate", "distinct types", "unknown types" },
            coverage.Select(v => (IReadOnlyList<string>)new[]
            {
                v.Part, v.Tokens.ToString("N0", Inv), v.UnknownTokens.ToString("N0", Inv), Html.Pct(v.UnknownRate, 2),
                v.Types.ToString("N0", Inv), v.UnknownTypes.ToString("N0", Inv),
            }), "Vocabulary coverage (vocabulary built from the training part only)");
        string cut = Html.Table(new[] { "item", "value" }, new[]
        {
            new[] { "maximum length", $"{truncation.MaxLength} tokens, policy {truncation.Policy}" },
            new[] { "rows cut", $"{Html.Count(truncation.TruncatedRows)} of {Html.Count(truncation.Rows)} ({Html.Pct(truncation.TruncatedShare)})" },
            new[] { "tokens dropped", $"{Html.Count(truncation.TokensDropped)} of {Html.Count((truncation.TokensDropped + truncation.TokensKept))}" },
            new[] { "longest row", $"{truncation.LongestBefore} tokens" },
            new[] { "rows with no tokens", truncation.EmptyRows.ToString("N0", Inv) },
        }, "Truncation", numericRight: false);
        return new TextView("Vocabulary and truncation", cov + cut);
    }
}
