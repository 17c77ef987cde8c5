using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Views;

namespace Kit.Tests.Views;

public class ViewTests
{
    static readonly ViewSamples S = new();

    public static IEnumerable<object[]> EveryChart()
    {
        var table = S.Table();
        var profile = DatasetProfile.Compute(table, new CharacterTokenizer());
        var split = Splitter.StratifiedHoldout(table.LabelIds(), 0.6, 0.2, 0.2, 3, profile.RowLengths);
        var charts = new List<ChartView>
        {
            DataViews.ClassBalance(profile), DataViews.LengthHistogram(profile),
            StackView.ChartsIn(new IView[] { DataViews.Split(split.Summary, ViewSamples.Names) }).Single(),
            HistoryViews.Curves(ViewSamples.History()),
            MetricsViews.PerClass(S.Metrics), MetricsViews.Confusion(S.Metrics, false), MetricsViews.Confusion(S.Metrics, true),
            LengthViews.Accuracy(S.ByLength()), LengthViews.ClassByBin(S.ByLength().ByClass),
            CalibrationViews.Reliability(S.Calibration()), CalibrationViews.Reliability(S.Calibration(BinningScheme.EqualMass)),
            CalibrationViews.PerClass(S.Calibration()),
            StackView.ChartsIn(new IView[] { CalibrationViews.Temperature(S.Temperature(), S.Calibration(), S.Calibration()) }).Single(),
            ProjectionViews.Tokens(ViewSamples.Tokens()), ProjectionViews.Sequences(S.Sequences()), ProjectionViews.Sequences(S.Sequences(ProjectionMethod.Tsne)),
        };
        return charts.Select(c => new object[] { c.Title, c });
    }

    [Theory]
    [MemberData(nameof(EveryChart))]
    public void Every_chart_has_a_title_and_titled_axes_and_renders_one_plot(string title, ChartView chart)
    {
        Assert.Equal(title, chart.Title);
        FigureChecks.HasTitledAxes(chart);
        Assert.Equal(1, chart.ChartCount);
        string html = chart.ToHtml();
        Assert.Single(Regex.Matches(html, "data-kit-chart=\"1\""));
        Assert.DoesNotContain("<script src", html);
        // The hostile class name never appears as markup, in the figure or in the fragment.
        Assert.DoesNotContain(ViewSamples.Hostile, html);
    }

    [Fact]
    public void Confusion_heat_map_carries_the_counts_and_the_row_shares()
    {
        var counts = FigureChecks.Parse(MetricsViews.Confusion(S.Metrics, false)).Data[0]!["z"]!.AsArray();
        var shares = FigureChecks.Parse(MetricsViews.Confusion(S.Metrics, true)).Data[0]!["z"]!.AsArray();
        int k = ViewSamples.Names.Length;
        for (int i = 0; i < k; i++)
            for (int j = 0; j < k; j++)
            {
                Assert.Equal(S.Metrics.Confusion[i, j], counts[i]![j]!.GetValue<double>());
                Assert.Equal(S.Metrics.ConfusionNormalised[i, j], shares[i]![j]!.GetValue<double>(), 12);
            }
        // Each row of the normalised map sums to 1 (every class has rows in this sample).
        for (int i = 0; i < k; i++) Assert.Equal(1.0, shares[i]!.AsArray().Sum(v => v!.GetValue<double>()), 12);
    }

    [Fact]
    public void Per_class_bars_are_the_records_scores_with_true_rows_in_the_ticks()
    {
        var chart = MetricsViews.PerClass(S.Metrics);
        Assert.Equal(S.Metrics.PerClass.Select(c => (double?)c.Precision), FigureChecks.Numbers(FigureChecks.Trace(chart, "precision")["y"]));
        Assert.Equal(S.Metrics.PerClass.Select(c => (double?)c.Recall), FigureChecks.Numbers(FigureChecks.Trace(chart, "recall")["y"]));
        Assert.Equal(S.Metrics.PerClass.Select(c => (double?)c.F1), FigureChecks.Numbers(FigureChecks.Trace(chart, "F1")["y"]));
        var ticks = FigureChecks.Trace(chart, "F1")["x"]!.AsArray().Select(t => t!.GetValue<string>()).ToArray();
        Assert.Equal($"alpha (n={S.Metrics.PerClass[0].TrueRows})", ticks[0]);
        Assert.Equal($"&lt;/script&gt;&lt;b&gt;bold&lt;/b&gt; (n={S.Metrics.PerClass[2].TrueRows})", ticks[2]);
    }

    [Fact]
    public void Accuracy_by_length_draws_the_wilson_band_and_the_bin_counts()
    {
        var b = S.ByLength();
        var chart = LengthViews.Accuracy(b);
        Assert.Equal(b.Rows.Select(r => (double?)r.Accuracy), FigureChecks.Numbers(FigureChecks.Trace(chart, "accuracy")["y"]));
        Assert.Equal(b.Rows.Select(r => (double?)r.Count), FigureChecks.Numbers(FigureChecks.Trace(chart, "rows in bin")["y"]));
        var band = FigureChecks.Parse(chart).Data.Where(t => t!["name"]!.GetValue<string>() == "95 % Wilson interval").ToArray();
        Assert.Equal(2, band.Length);
        Assert.Equal(b.Rows.Select(r => (double?)r.WilsonHigh), FigureChecks.Numbers(band[0]!["y"]));
        Assert.Equal(b.Rows.Select(r => (double?)r.WilsonLow), FigureChecks.Numbers(band[1]!["y"]));
        Assert.Equal("tonexty", band[1]!["fill"]!.GetValue<string>());
        Assert.Equal(S.Labels.Length, b.Rows.Sum(r => r.Count));
        // Every band contains its accuracy, otherwise the two traces were paired with the wrong bins.
        Assert.All(b.Rows.Where(r => r.Count > 0), r => Assert.InRange(r.Accuracy, r.WilsonLow, r.WilsonHigh));
    }

    [Fact]
    public void Class_by_length_cells_are_recall_and_empty_cells_are_gaps()
    {
        // Class 0 has no rows in the last bin here, so that cell must be a gap, never a 0 % recall.
        var table = new ClassByBinTable(new[] { "a", "b" }, new[] { "[1, 5)", "[5, 9]" }, new[,] { { 4, 0 }, { 2, 5 } }, new[,] { { 3, 0 }, { 1, 5 } });
        var z = FigureChecks.Parse(LengthViews.ClassByBin(table)).Data[0]!["z"]!.AsArray();
        Assert.Equal(0.75, z[0]![0]!.GetValue<double>());
        Assert.Null(z[0]![1]);
        Assert.Equal(0.5, z[1]![0]!.GetValue<double>());
        Assert.Equal(1.0, z[1]![1]!.GetValue<double>());
    }

    [Fact]
    public void Reliability_diagram_shows_ece_in_the_title_and_one_point_per_filled_bin()
    {
        var r = S.Calibration();
        var chart = CalibrationViews.Reliability(r);
        string title = FigureChecks.Title(chart);
        Assert.Contains($"ECE {Html.Pct(r.Ece)}", title);
        Assert.Contains($"MCE {Html.Pct(r.Mce)}", title);
        Assert.Contains(Html.Pct(r.EceInterval.Low), title);
        var filled = r.Bins.Where(b => b.Count > 0).ToArray();
        var points = FigureChecks.Trace(chart, "observed accuracy");
        Assert.Equal(filled.Select(b => (double?)b.MeanConfidence), FigureChecks.Numbers(points["x"]));
        Assert.Equal(filled.Select(b => (double?)b.Accuracy), FigureChecks.Numbers(points["y"]));
        Assert.Equal(S.Labels.Length, FigureChecks.Numbers(FigureChecks.Trace(chart, "rows per bin")["y"]).Sum(v => v ?? 0));
        Assert.Contains("equal-mass", FigureChecks.Title(CalibrationViews.Reliability(S.Calibration(BinningScheme.EqualMass))));
        var diagonal = FigureChecks.Trace(chart, "confidence = accuracy");
        Assert.Equal(new double?[] { 0, 1 }, FigureChecks.Numbers(diagonal["x"]));
        Assert.Equal(new double?[] { 0, 1 }, FigureChecks.Numbers(diagonal["y"]));
    }

    [Fact]
    public void Per_class_reliability_has_one_titled_panel_per_class()
    {
        var r = S.Calibration();
        var (data, layout) = FigureChecks.Parse(CalibrationViews.PerClass(r));
        int k = ViewSamples.Names.Length;
        Assert.Equal(k, layout.Count(p => p.Key.StartsWith("xaxis", StringComparison.Ordinal)));
        Assert.Equal(k, layout.Count(p => p.Key.StartsWith("yaxis", StringComparison.Ordinal)));
        var notes = layout["annotations"]!.AsArray().Select(a => a!["text"]!.GetValue<string>()).ToArray();
        for (int c = 0; c < k; c++)
            Assert.Contains($"<b>{Figure.Text(r.PerClass[c].Class)}</b> · ECE {Html.Pct(r.PerClass[c].Ece)}", notes);
        // Panels do not overlap: x domains of one row are disjoint.
        var domains = Enumerable.Range(0, k).Select(c => layout[c == 0 ? "xaxis" : $"xaxis{c + 1}"]!["domain"]!.AsArray().Select(v => v!.GetValue<double>()).ToArray())
            .OrderBy(d => d[0]).ToArray();
        for (int i = 1; i < domains.Length; i++) Assert.True(domains[i][0] >= domains[i - 1][1], "overlapping panels");
        Assert.Equal(3 * k, data.Count);
    }

    [Fact]
    public void Temperature_view_reports_the_fitted_temperature_and_both_ece_values()
    {
        var t = S.Temperature();
        var view = CalibrationViews.Temperature(t, S.Calibration(), S.Calibration());
        var chart = StackView.ChartsIn(new IView[] { view }).Single();
        string title = FigureChecks.Title(chart);
        Assert.Contains($"T = {Html.Num(t.Temperature, 2)}", title);
        Assert.Contains($"{Html.Pct(t.TestEceBefore)} → {Html.Pct(t.TestEceAfter)}", title);
        Assert.Equal(1, view.ChartCount);
        Assert.Contains(Html.Num(t.ValidationNllAfter), view.ToHtml());
    }

    [Fact]
    public void Sequence_projection_colours_by_label_marks_wrong_rows_and_hovers_the_text()
    {
        var p = S.Sequences();
        var data = FigureChecks.Parse(ProjectionViews.Sequences(p)).Data;
        var classTraces = data.Where(t => t!["legendgroup"]!.GetValue<string>().StartsWith("class:", StringComparison.Ordinal)).ToArray();
        Assert.Equal(p.Points.Count, classTraces.Sum(t => t!["x"]!.AsArray().Count));
        int crosses = classTraces.Where(t => t!["marker"]!["symbol"]!.GetValue<string>() == "x").Sum(t => t!["x"]!.AsArray().Count);
        Assert.Equal(S.Labels.Zip(S.Metrics.Predicted).Count(z => z.First != z.Second), crosses);
        var texts = classTraces.SelectMany(t => t!["text"]!.AsArray().Select(s => s!.GetValue<string>())).ToArray();
        Assert.Contains("&lt;/script&gt;&lt;b&gt;bold&lt;/b&gt;.example", texts);
        // One legend entry per class, and it is never the cross that means "wrong".
        var entries = classTraces.Where(t => t!["showlegend"]!.GetValue<bool>()).ToArray();
        Assert.Equal(ViewSamples.Names.Select(Figure.Text).Order(StringComparer.Ordinal),
            entries.Select(t => t!["name"]!.GetValue<string>()).Order(StringComparer.Ordinal));
        Assert.All(entries, t => Assert.Equal("circle", t!["marker"]!["symbol"]!.GetValue<string>()));
    }

    [Fact]
    public void Token_projection_labels_each_token_and_names_white_space()
    {
        var p = ViewSamples.Tokens();
        var trace = FigureChecks.Parse(ProjectionViews.Tokens(p)).Data[0]!;
        var text = trace["text"]!.AsArray().Select(t => t!.GetValue<string>()).ToArray();
        Assert.Equal(p.Points.Count, text.Length);
        Assert.Contains("␣", text);
        Assert.Contains("&lt;/script&gt;&lt;b&gt;bold&lt;/b&gt;", text);
        Assert.StartsWith("PC 1 (", FigureChecks.Parse(ProjectionViews.Tokens(p)).Layout["xaxis"]!["title"]!["text"]!.GetValue<string>());
    }

    [Fact]
    public void Occlusion_colours_each_token_by_its_drop()
    {
        var r = ViewSamples.Occlusion(out var pieces);
        Assert.Equal(0.1, r.Positions[0].Drop, 12);
        Assert.Equal(0.0, r.Positions[1].Drop, 12);
        string html = OcclusionViews.Tokens(r, pieces, "alpha").ToHtml();
        var spans = Regex.Matches(html, "<span class=\"kit-token[^\"]*\" style=\"background:([^\"]+)\" title=\"[^\"]*\">([^<]*)</span>")
            .Select(m => (Colour: m.Groups[1].Value, Text: m.Groups[2].Value)).Take(pieces.Length).ToArray();
        Assert.Equal(pieces.Length, spans.Length);
        Assert.Equal("rgba(46,94,140,0.600)", spans[0].Colour);   // the largest drop gets the full colour
        Assert.Equal("rgba(46,94,140,0.000)", spans[1].Colour);   // no change, no colour
        Assert.Equal("&lt;", spans[1].Text);
        Assert.Equal("&amp;", spans[3].Text);
        Assert.Equal("&lt;/script&gt;&lt;b&gt;bold&lt;/b&gt;", spans[4].Text);
        Assert.DoesNotContain(ViewSamples.Hostile, html);
        Assert.Throws<ArgumentException>(() => OcclusionViews.Tokens(r, pieces[..2], "alpha"));
    }

    [Fact]
    public void Occlusion_colour_is_blue_for_support_and_brick_against_scaled_to_the_largest()
    {
        Assert.Equal("rgba(168,68,58,0.300)", OcclusionViews.Colour(-0.05, 0.1));
        Assert.Equal("rgba(46,94,140,0.600)", OcclusionViews.Colour(0.2, 0.1));   // capped
        Assert.Equal("rgba(46,94,140,0.000)", OcclusionViews.Colour(0.2, 0));
    }

    [Fact]
    public void The_metrics_summary_shows_accuracy_and_macro_f1_intervals_when_given()
    {
        var intervals = HeadlineIntervals.Of(S.Metrics, 300, 5);
        string html = MetricsViews.Summary(S.Metrics, intervals).ToHtml();
        Assert.Contains("95 % interval", html);
        Assert.Contains($"{Html.Pct(intervals.AccuracyLow)} – {Html.Pct(intervals.AccuracyHigh)}", html);
        Assert.Contains($"{Html.Num(intervals.MacroF1Low)} – {Html.Num(intervals.MacroF1High)}", html);
        Assert.Contains("<th>true rows</th>", html);
        Assert.DoesNotContain("support", html);
        string plain = MetricsViews.Summary(S.Metrics).ToHtml();
        Assert.DoesNotContain("95 % interval", plain);
    }

    [Fact]
    public void Error_tables_escape_the_text_and_list_the_records_rows()
    {
        var e = S.Errors();
        string html = ErrorViews.Tables(e).ToHtml();
        Assert.DoesNotContain(ViewSamples.Hostile, html);
        foreach (var m in e.SureMistakes) Assert.Contains(Html.Escape(m.Text), html);
        Assert.Contains($"{e.Mistakes} of {e.Count}", html);
        Assert.Equal(e.SureMistakes.Count + e.CostliestRows.Count + e.MixedUpPairs.Count + 3, Regex.Matches(html, "<tr>").Count);
        foreach (var caption in new[] { "Wrong and sure", "Costliest rows", "Class pairs mixed up most often" }) Assert.Contains(caption, html);
    }

    [Fact]
    public void Data_views_show_the_profile_split_and_leakage_records()
    {
        var table = S.Table();
        var profile = DatasetProfile.Compute(table, new CharacterTokenizer());
        var balance = DataViews.ClassBalance(profile);
        var rows = FigureChecks.Numbers(FigureChecks.Parse(balance).Data[0]!["x"]);
        Assert.Equal(profile.Classes.Select(c => (double?)c.Rows).Order(), rows);
        var histogram = FigureChecks.Parse(DataViews.LengthHistogram(profile)).Data;
        Assert.Equal(table.Count, histogram.Sum(t => FigureChecks.Numbers(t!["y"]).Sum(v => v ?? 0)));

        // Rows 0 and 1 share a text; put them in different parts so the audit must report it.
        var split = new Split(Enumerable.Range(0, 200).Where(i => i != 1).ToArray(), Array.Empty<int>(), new[] { 1 }.Concat(Enumerable.Range(200, 40)).ToArray(),
            SplitSummary.Of("by hand", 0, table.LabelIds(), profile.RowLengths));
        var leak = LeakageAudit.Run(table, split);
        Assert.False(leak.Clean);
        string html = DataViews.Leakage(leak).ToHtml();
        Assert.Contains("kit-warn", html);
        Assert.Contains(LeakFinding.ExactAcrossParts, html);
        Assert.DoesNotContain(ViewSamples.Hostile, html);
        var summary = SplitSummary.Of("by hand", 0, table.LabelIds(), profile.RowLengths, ("train", split.Train), ("test", split.Test));
        Assert.Equal(DataViews.WorstShareGap(summary), summary.Parts[0].Proportions.Zip(summary.Parts[1].Proportions).Max(z => Math.Abs(z.First - z.Second)), 12);
    }

    [Fact]
    public void Titles_split_into_what_and_what_to_read()
    {
        Assert.Equal("<b>Plain</b>", Theme.TitleMarkup("Plain"));
        string t = Theme.TitleMarkup("Accuracy — lowest in <short>");
        Assert.StartsWith("<b>Accuracy</b><br><span", t);
        Assert.EndsWith(">lowest in &lt;short&gt;</span>", t);
    }

    [Fact]
    public void Stack_views_count_and_list_their_charts()
    {
        var a = HistoryViews.Curves(ViewSamples.History());
        var b = MetricsViews.PerClass(S.Metrics);
        var inner = new StackView("inner", new IView[] { b, TextView.Paragraph("p", "x") });
        var outer = new StackView("outer", new IView[] { a, inner });
        Assert.Equal(2, outer.ChartCount);
        Assert.Equal(new[] { a, b }, StackView.ChartsIn(new IView[] { outer, TextView.Paragraph("q", "y") }));
    }

    [Fact]
    public void Missing_numbers_become_json_nulls_not_zeros()
    {
        var arr = Figure.Numbers(new[] { 1.5, double.NaN, double.PositiveInfinity });
        Assert.Equal("[1.5,null,null]", arr.ToJsonString());
    }

    [Theory]
    [InlineData("1,234", true)]
    [InlineData("92.2 %", true)]
    [InlineData("–", true)]
    [InlineData("-0.005", true)]
    [InlineData("88966plair", false)]
    [InlineData("5fb32", false)]
    [InlineData("", false)]
    public void Only_number_like_cells_are_right_aligned(string cell, bool numeric)
    {
        Assert.Equal(numeric, Html.LooksNumeric(cell));
        string html = Html.Table(new[] { "a", "b" }, new[] { new[] { cell, cell } }, textColumns: new[] { 1 });
        Assert.Equal(numeric ? 1 : 0, Regex.Matches(html, "<td class=\"num\">").Count);
    }
}
