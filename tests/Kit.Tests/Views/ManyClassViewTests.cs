using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using Kit.Diagnostics;
using Kit.Views;

namespace Kit.Tests.Views;

/// <summary>The per-class views above the many-class threshold, on synthetic 45-class predictions (<see cref="ManyClassSamples"/>).</summary>
public class ManyClassViewTests
{
    static readonly ManyClassSamples S = new();

    static string[] Strings(JsonNode? array) => array!.AsArray().Select(v => v!.GetValue<string>()).ToArray();

    [Fact]
    public void The_threshold_is_twelve_classes()
    {
        Assert.False(ManyClasses.Apply(12));
        Assert.True(ManyClasses.Apply(13));
        Assert.True(ManyClasses.TextWidth("coolant-wear-intermittent-under-load", 11) > ManyClasses.TextWidth("pump-leak", 11));
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Confusion_orders_confused_groups_together_and_prints_only_nonzero_numbers_that_fit(bool normalised)
    {
        var m = S.Metrics;
        var chart = MetricsViews.Confusion(m, normalised);
        var (data, layout) = FigureChecks.Parse(chart);
        var trace = data.Single()!;
        var x = Strings(trace["x"]);
        Assert.Equal(Strings(trace["y"]), x);
        var index = x.Select(n => Array.IndexOf(m.ClassNames.Select(Figure.Text).ToArray(), n)).ToArray();
        Assert.Equal(Enumerable.Range(0, ManyClassSamples.Classes), index.Order());
        // Each hidden group of five sits in five neighbouring rows.
        for (int g = 0; g < ManyClassSamples.Groups; g++)
        {
            var at = Enumerable.Range(0, index.Length).Where(p => ManyClassSamples.GroupOf(index[p]) == g).ToArray();
            Assert.True(at.Max() - at.Min() == at.Length - 1, $"group {g} at positions {string.Join(",", at)}");
        }
        var text = trace["text"]!.AsArray();
        int printed = 0;
        for (int r = 0; r < index.Length; r++)
            for (int c = 0; c < index.Length; c++)
            {
                string cell = text[r]![c]!.GetValue<string>();
                int count = m.Confusion[index[r], index[c]];
                if (count == 0) Assert.Equal("", cell);
                if (cell.Length == 0) continue;
                printed++;
                Assert.True(ManyClasses.TextWidth(cell, 9) + 2 <= 18, $"'{cell}' does not fit a cell");
                Assert.Equal(normalised ? (100 * m.ConfusionNormalised[index[r], index[c]] < 0.5 ? "<1" : Html.Pct(m.ConfusionNormalised[index[r], index[c]], 0).Replace(" %", "")) : count.ToString(), cell);
            }
        Assert.InRange(printed, 45, 45 * 45 / 2);
        // The colour scale stops at the largest mistake, so off-diagonal blocks are visible next to a full diagonal.
        double offMax = Enumerable.Range(0, 45).SelectMany(i => Enumerable.Range(0, 45).Where(j => j != i).Select(j => normalised ? m.ConfusionNormalised[i, j] : m.Confusion[i, j])).Max();
        Assert.Equal(offMax, trace["zmax"]!.GetValue<double>(), 12);
        // Colour bar ticks never repeat a label: whole-row steps for counts, enough decimals for shares.
        var bar = trace["colorbar"]!;
        if (normalised)
        {
            string format = bar["tickformat"]!.GetValue<string>();
            int decimals = int.Parse(format[1..^1]);
            double step = offMax / 10;   // finer than any step plotly picks for a colour bar of this length
            var labels = Enumerable.Range(0, 11).Select(i => (100 * i * step).ToString("F" + decimals, System.Globalization.CultureInfo.InvariantCulture)).ToArray();
            Assert.True(labels.Distinct().Count() == labels.Length, $"{format} repeats labels at step {step}");
        }
        else
        {
            Assert.Equal(0, bar["tick0"]!.GetValue<int>());
            double dtick = bar["dtick"]!.GetValue<double>();
            Assert.True(dtick >= 1 && dtick == Math.Floor(dtick), $"dtick {dtick}");
        }
        Assert.True(layout["height"]!.GetValue<int>() >= 18 * 45);
        Assert.Equal(1, layout["xaxis"]!["dtick"]!.GetValue<int>());
        Assert.True(layout["margin"]!["l"]!.GetValue<int>() >= x.Max(n => ManyClasses.TextWidth(n, 11)));
        FigureChecks.HasTitledAxes(chart);
    }

    [Fact]
    public void Confused_pairs_are_ranked_by_rows_with_the_reverse_direction_beside()
    {
        var m = S.Metrics;
        string html = ManyClassViews.ConfusedPairs(m).ToHtml();
        var rows = Regex.Matches(html, "<tr><td class=\"num\">(\\d+)</td><td>([^<]*)</td><td>([^<]*)</td><td class=\"num\">([\\d,]+)</td>").ToArray();
        Assert.Equal(ManyClasses.ConfusedPairs, rows.Length);
        var counts = rows.Select(r => int.Parse(r.Groups[4].Value.Replace(",", ""))).ToArray();
        Assert.Equal(counts.OrderByDescending(c => c), counts);
        int best = Enumerable.Range(0, 45).SelectMany(i => Enumerable.Range(0, 45).Where(j => j != i).Select(j => m.Confusion[i, j])).Max();
        Assert.Equal(best, counts[0]);
        // Synthetic groups: every top pair is inside one group.
        var names = m.ClassNames.Select(System.Net.WebUtility.HtmlEncode).ToList();
        foreach (var r in rows)
            Assert.Equal(ManyClassSamples.GroupOf(names.IndexOf(r.Groups[2].Value)), ManyClassSamples.GroupOf(names.IndexOf(r.Groups[3].Value)));
        Assert.DoesNotContain(ViewSamples.Hostile, html);
    }

    [Fact]
    public void Per_class_scores_are_one_sorted_row_per_class_with_room_for_the_labels()
    {
        var m = S.Metrics;
        var chart = MetricsViews.PerClass(m);
        var (data, layout) = FigureChecks.Parse(chart);
        var bars = data.Single(t => t!["name"]!.GetValue<string>() == "F1")!;
        Assert.Equal("h", bars["orientation"]!.GetValue<string>());
        var f1 = FigureChecks.Numbers(bars["x"]).Select(v => v!.Value).ToArray();
        Assert.Equal(45, f1.Length);
        Assert.Equal(f1.Order(), f1);
        Assert.Equal(m.PerClass.Min(c => c.F1), f1[0], 12);
        Assert.Equal(3, data.Count);   // F1 bars, precision and recall markers
        var labels = Strings(bars["y"]);
        Assert.Equal(45, labels.Distinct().Count());
        Assert.True(layout["margin"]!["l"]!.GetValue<int>() >= labels.Max(l => ManyClasses.TextWidth(l, 11)));
        Assert.True(layout["height"]!.GetValue<int>() >= 20 * 45);
        Assert.Equal("reversed", layout["yaxis"]!["autorange"]!.GetValue<string>());
        FigureChecks.HasTitledAxes(chart);
    }

    [Fact]
    public void Length_histogram_keeps_the_largest_classes_and_folds_the_rest_into_one_band()
    {
        var p = S.Profile();
        var chart = DataViews.LengthHistogram(p);
        var (data, _) = FigureChecks.Parse(chart);
        Assert.Equal(ManyClasses.StackedKept + 1, data.Count);
        var largest = p.Classes.OrderByDescending(c => c.Rows).Take(ManyClasses.StackedKept).Select(c => Figure.Text(c.Name)).ToArray();
        Assert.Equal(largest, data.Take(ManyClasses.StackedKept).Select(t => t!["name"]!.GetValue<string>()));
        var other = data[^1]!;
        Assert.Equal($"other {45 - ManyClasses.StackedKept} classes", other["name"]!.GetValue<string>());
        var total = Enumerable.Range(0, p.Histogram.Count).Select(b => data.Sum(t => FigureChecks.Numbers(t!["y"])[b]!.Value)).ToArray();
        Assert.Equal(p.Histogram.Select(b => (double)b.RowsByClass.Sum()), total);
        Assert.Equal(p.Rows, total.Sum());
        Assert.Equal(45 - ManyClasses.StackedKept, p.Classes.Count - largest.Length);
        FigureChecks.HasTitledAxes(chart);
    }

    [Fact]
    public void Split_shares_are_one_row_per_class_largest_first()
    {
        var p = S.Profile();
        var table = new Kit.Data.LabelledTable("many-classes.csv", S.Texts, S.Labels.Select(l => S.Names[l]).ToArray());
        var split = Kit.Data.Splitter.StratifiedHoldout(table.LabelIds(), 0.7, 0.15, 0.15, 3, p.RowLengths);
        var names = table.LabelMap().Names;
        var view = DataViews.Split(split.Summary, names);
        var chart = StackView.ChartsIn([view]).Single();
        var (data, layout) = FigureChecks.Parse(chart);
        Assert.Equal(3, data.Count);
        Assert.All(data, t => Assert.Equal("h", t!["orientation"]!.GetValue<string>()));
        var y = Strings(data[0]!["y"]);
        Assert.Equal(45, y.Length);
        var rows = y.Select(n => p.Classes.Single(c => Figure.Text(c.Name) == n).Rows).ToArray();
        Assert.Equal(rows.OrderByDescending(r => r), rows);
        var train = FigureChecks.Numbers(data[0]!["x"]);
        int first = Array.IndexOf(names.Select(Figure.Text).ToArray(), y[0]);
        Assert.Equal(split.Summary.Parts[0].Proportions[first], train[0]!.Value, 12);
        Assert.True(layout["margin"]!["l"]!.GetValue<int>() >= y.Max(n => ManyClasses.TextWidth(n, 11)));
        FigureChecks.HasTitledAxes(chart);
    }

    [Fact]
    public void Reliability_draws_the_classes_of_largest_ece_and_tabulates_every_class()
    {
        var r = S.Calibration();
        var chart = CalibrationViews.PerClass(r);
        var (_, layout) = FigureChecks.Parse(chart);
        var titles = layout["annotations"]!.AsArray().Select(a => a!["text"]!.GetValue<string>()).ToArray();
        Assert.Equal(ManyClasses.ReliabilityPanels, titles.Length);
        var expected = r.PerClass.OrderByDescending(c => c.Ece).Take(ManyClasses.ReliabilityPanels).ToArray();
        for (int i = 0; i < titles.Length; i++) Assert.Equal($"<b>{Figure.Text(expected[i].Class)}</b> · ECE {Html.Pct(expected[i].Ece)}", titles[i]);
        // Titles on one row leave each other the estimated width of the longest title (the long synthetic names force fewer columns).
        var notes = layout["annotations"]!.AsArray().Select(a => (X: a!["x"]!.GetValue<double>(), Y: a["y"]!.GetValue<double>())).ToArray();
        double widest = expected.Max(c => ManyClasses.TextWidth($"{c.Class} · ECE {Html.Pct(c.Ece)}", 12));
        foreach (var row in notes.GroupBy(n => Math.Round(n.Y, 6)))
        {
            var xs = row.Select(n => n.X).Order().ToArray();
            for (int i = 1; i < xs.Length; i++) Assert.True((xs[i] - xs[i - 1]) * 880 >= widest, $"panel titles {xs[i - 1]} and {xs[i]} closer than {widest} px");
        }
        FigureChecks.HasTitledAxes(chart);
        var views = ManyClassViews.Reliability(r);
        Assert.Equal(2, views.Length);
        string table = views[1].ToHtml();
        Assert.Equal(45, Regex.Matches(table, "<tr><td class=\"num\">").Count);
        Assert.Equal(ManyClasses.ReliabilityPanels, Regex.Matches(table, "panel above").Count);
        Assert.Contains(Html.Pct(r.ClasswiseEce), table);
    }

    [Fact]
    public void The_notebook_formatters_show_the_many_class_forms()
    {
        Assert.True(ViewRegistry.TryGetView(S.Metrics, out var metrics));
        Assert.Contains("Most confused pairs", metrics!.ToHtml());
        Assert.Contains(StackView.ChartsIn([metrics]), c => c.Title == "Confusion matrix (counts)" && FigureChecks.Parse(c).Data[0]!["xgap"] is not null);
        Assert.True(ViewRegistry.TryGetView(S.Calibration(), out var calibration));
        Assert.Contains("Per-class ECE", calibration!.ToHtml());
        Assert.True(ViewRegistry.TryGetView(S.Profile(), out var profile));
        Assert.Contains($"other {45 - ManyClasses.StackedKept} classes", profile!.ToHtml());
    }

    [Fact]
    public void Seven_classes_keep_the_full_forms()
    {
        var few = new ViewSamples();
        var (data, _) = FigureChecks.Parse(MetricsViews.PerClass(few.Metrics));
        Assert.Equal(3, data.Count);
        Assert.All(data, t => Assert.Equal("bar", t!["type"]!.GetValue<string>()));
        var confusion = FigureChecks.Parse(MetricsViews.Confusion(few.Metrics, normalised: false)).Data[0]!;
        Assert.Equal(Figure.Texts(few.Metrics.ClassNames).ToJsonString(), confusion["x"]!.ToJsonString());   // input order
        Assert.All(confusion["text"]!.AsArray().SelectMany(r => r!.AsArray()), c => Assert.NotEqual("", c!.GetValue<string>()));
        Assert.False(ViewRegistry.TryGetView(few.Metrics, out var v) && v!.ToHtml().Contains("Most confused pairs"));
        Assert.Single(ManyClassViews.Reliability(few.Calibration()));
    }
}
