using System.Globalization;
using System.Text.Json.Nodes;
using Kit.Common;
using Kit.Experiments;
using Kit.Views;

namespace Kit.Tests.Views;

public class AxisTicksTests
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The rules every tick set keeps, whatever the range.</summary>
    static void Holds(AxisTicks t, double low, double high, RateFormat format)
    {
        string at = $"[{low.ToString("R", Inv)}, {high.ToString("R", Inv)}]";
        Assert.True(t.Values.Count is >= 4 and <= 7, $"{at}: {t.Values.Count} ticks");
        Assert.Equal(t.Values.Count, t.Labels.Distinct(StringComparer.Ordinal).Count());
        Assert.True(t.Values[0] <= low + 1e-12 && t.Values[^1] >= high - 1e-12, $"{at}: ticks {t.Values[0]}..{t.Values[^1]} do not cover the data");
        // A 1, 2 or 5 × 10^k step, evenly spaced.
        double mantissa = t.Step / Math.Pow(10, Math.Floor(Math.Log10(t.Step) + 1e-9));
        Assert.Contains(Math.Round(mantissa, 6), new[] { 1.0, 2.0, 5.0 });
        for (int i = 1; i < t.Values.Count; i++) Assert.Equal(t.Step, t.Values[i] - t.Values[i - 1], 9);
        // Each label reads as its value (to the label's own precision), so the scale does not lie.
        for (int i = 0; i < t.Values.Count; i++)
        {
            string text = t.Labels[i].TrimEnd('%');
            double read = double.Parse(text, Inv) / (format == RateFormat.Percent ? 100 : 1);
            int decimals = text.Contains('.') ? text.Length - text.IndexOf('.') - 1 : 0;
            double resolution = Math.Pow(10, -decimals) / (format == RateFormat.Percent ? 100 : 1);
            Assert.True(Math.Abs(read - t.Values[i]) <= resolution / 2 + 1e-12, $"{at}: label {t.Labels[i]} for {t.Values[i]}");
        }
        // Rates in [0, 1] keep their ticks in [0, 1].
        if (low >= 0 && high <= 1) Assert.True(t.Values[0] >= -1e-12 && t.Values[^1] <= 1 + 1e-12, $"{at}: ticks leave [0, 1]");
    }

    [Fact]
    public void The_issue_range_reads_84_to_87_percent_with_no_repeats()
    {
        var t = AxisTicks.For(0.844, 0.864);
        Assert.Equal(["84%", "85%", "86%", "87%"], t.Labels);
        var narrow = AxisTicks.For(0.991, 0.999);
        Assert.Equal(["99.0%", "99.2%", "99.4%", "99.6%", "99.8%", "100.0%"], narrow.Labels);
        var fraction = AxisTicks.For(0.2, 0.21, RateFormat.Fraction);
        Assert.Equal(["0.200", "0.202", "0.204", "0.206", "0.208", "0.210"], fraction.Labels);
    }

    [Fact]
    public void Random_narrow_and_wide_ranges_get_distinct_labels_that_cover_the_data()
    {
        var rng = new SplitMix64(2026);
        for (int i = 0; i < 5000; i++)
        {
            // Spans from 1e-6 to the whole [0, 1], centred anywhere, half of them as fractions.
            double span = Math.Pow(10, -6 + 6 * rng.NextDouble());
            double low = (1 - span) * rng.NextDouble(), high = low + span;
            var format = i % 2 == 0 ? RateFormat.Percent : RateFormat.Fraction;
            Holds(AxisTicks.For(low, high, format), low, high, format);
        }
        foreach (var (low, high) in new[] { (0.844, 0.864), (0.991, 0.999), (0.2, 0.21), (0.0, 1.0), (0.5, 0.5), (0.0, 0.0), (1.0, 1.0), (0.9999, 1.0) })
        {
            Holds(AxisTicks.For(low, high), Math.Min(low, high), Math.Max(low, high), RateFormat.Percent);
            Holds(AxisTicks.For(low, high, RateFormat.Fraction), low, high, RateFormat.Fraction);
        }
    }

    [Fact]
    public void Log_count_ticks_never_repeat_and_read_as_their_values()
    {
        var rng = new SplitMix64(17);
        for (int i = 0; i < 2000; i++)
        {
            double low = 6 * rng.NextDouble(), high = low + 0.3 + 5 * rng.NextDouble();
            var axis = AxisTicks.ApplyLogCounts(new JsonObject(), low, high);
            var values = axis["tickvals"]!.AsArray().Select(v => v!.GetValue<double>()).ToArray();
            var labels = axis["ticktext"]!.AsArray().Select(v => v!.GetValue<string>()).ToArray();
            Assert.True(values.Length >= 2, $"[{low}, {high}]: {values.Length} ticks");
            Assert.Equal(labels.Length, labels.Distinct(StringComparer.Ordinal).Count());
            for (int k = 0; k < values.Length; k++)
            {
                string l = labels[k];
                double scale = l.EndsWith('k') ? 1e3 : l.EndsWith('M') ? 1e6 : l.EndsWith('G') ? 1e9 : 1;
                Assert.Equal(values[k], double.Parse(l.TrimEnd('k', 'M', 'G'), Inv) * scale, 6);
            }
        }
        Assert.Equal(["20k", "50k", "100k"],
            AxisTicks.ApplyLogCounts(new JsonObject(), Math.Log10(18_000), Math.Log10(110_000))["ticktext"]!.AsArray().Select(v => v!.GetValue<string>()));
    }

    [Fact]
    public void Applied_ticks_replace_plotly_formats_and_pad_the_range()
    {
        var axis = new JsonObject { ["tickformat"] = ".0%" };
        AxisTicks.For(0.844, 0.864).ApplyTo(axis);
        Assert.Null(axis["tickformat"]);
        Assert.Equal("array", axis["tickmode"]!.GetValue<string>());
        var range = axis["range"]!.AsArray().Select(v => v!.GetValue<double>()).ToArray();
        Assert.True(range[0] < 0.84 && range[1] > 0.87);
        Assert.Throws<ArgumentException>(() => AxisTicks.For(double.NaN, 1));
    }

    /// <summary>Every axis in the chart that carries written-out tick labels has no two alike, and no axis keeps a fixed-decimal percent format.</summary>
    internal static void NoRepeatedTicks(ChartView chart)
    {
        var (data, layout) = FigureChecks.Parse(chart);
        var axes = layout.Where(p => p.Key.StartsWith("xaxis", StringComparison.Ordinal) || p.Key.StartsWith("yaxis", StringComparison.Ordinal))
            .Select(p => (p.Key, Axis: p.Value as JsonObject))
            .Concat(data.Select((t, i) => ($"trace {i} colour bar", Axis: t!["colorbar"] as JsonObject)))
            .Where(a => a.Axis is not null);
        foreach (var (name, axis) in axes)
        {
            string? format = axis!["tickformat"]?.GetValue<string>();
            Assert.False(format is not null && format.EndsWith('%'), $"{chart.Title}: {name} still formats ticks as {format}");
            if (axis["ticktext"] is JsonArray texts)
            {
                var labels = texts.Select(t => t!.GetValue<string>()).ToArray();
                Assert.True(labels.Distinct(StringComparer.Ordinal).Count() == labels.Length, $"{chart.Title}: {name} repeats a tick label: {string.Join(", ", labels)}");
                Assert.Equal(axis["tickvals"]!.AsArray().Count, labels.Length);
            }
        }
    }

    static IEnumerable<ChartView> Charts(IView view) => view switch
    {
        ChartView c => [c],
        StackView s => s.Parts.SelectMany(Charts),
        _ => [],
    };

    [Fact]
    public void Views_built_on_the_samples_repeat_no_tick_label()
    {
        var charts = ReportSamples.AllViews().SelectMany(Charts).ToArray();
        Assert.True(charts.Length >= 15, $"only {charts.Length} charts");
        foreach (var chart in charts) NoRepeatedTicks(chart);
        // The rate axes all carry written-out ticks now (a rate axis left to plotly would not be checked above).
        Assert.True(charts.Count(c => FigureChecks.Parse(c).Layout.Any(p => p.Value is JsonObject axis && axis["ticktext"] is not null)) >= 8); // training history, class shares, per-class scores, accuracy by length, two reliability, per-class reliability, temperature
    }

    [Fact]
    public void Comparison_views_on_a_narrow_accuracy_range_repeat_no_tick_label()
    {
        var c = Kit.Tests.Experiments.ComparisonVerdictTests.NarrowComparison();
        foreach (var view in ComparisonReport.Views(c)) foreach (var chart in Charts(view)) NoRepeatedTicks(chart);
        var (_, layout) = FigureChecks.Parse(ComparisonViews.AccuracyByConfig(c));
        var ticks = layout["xaxis"]!["tickvals"]!.AsArray().Select(t => t!.GetValue<double>()).ToArray();
        Assert.All(c.Configs, s => Assert.InRange(s.Accuracy.Mean, ticks[0], ticks[^1]));
    }
}
