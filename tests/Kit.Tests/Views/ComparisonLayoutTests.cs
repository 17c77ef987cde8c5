using Kit.Experiments;
using Kit.Tests.Experiments;
using Kit.Views;

namespace Kit.Tests.Views;

public class ComparisonLayoutTests
{
    [Fact]
    public void Calibration_panels_per_row_shrink_until_the_widest_title_fits()
    {
        string[] shortTitles = ["gru · ECE 0.031", "lstm · ECE 0.040", "rnn · ECE 0.052", "naive Bayes · ECE 0.090"];
        Assert.Equal(4, ComparisonViews.CalibrationColumns(shortTitles));
        string[] longTitles = [.. shortTitles, "logistic regression · ECE 0.020", "cell=lstm;embed=32;hidden=128;bidirectional=false;dropout=0.2 · ECE 0.040"];
        int columns = ComparisonViews.CalibrationColumns(longTitles);
        Assert.True(columns < 4);
        double panel = (ComparisonViews.AssumedWidth - 64 - 24) / columns;
        Assert.All(longTitles, t => Assert.True(TextWidth.Pixels(t, 11) <= panel, $"{t} is wider than a {panel:F0} px panel"));
        Assert.Equal(1, ComparisonViews.CalibrationColumns(["only one"]));
    }

    [Fact]
    public void Text_width_grows_with_the_text_and_wide_letters_count_more()
    {
        Assert.True(TextWidth.Pixels("mmmm", 12) > TextWidth.Pixels("iiii", 12));
        Assert.Equal(2 * TextWidth.Pixels("gru · bi", 12), TextWidth.Pixels("gru · bi", 24), 9);
        Assert.Equal(0, TextWidth.Pixels("", 12));
    }

    [Fact]
    public void Point_labels_at_the_edges_of_the_size_chart_turn_inward_and_carry_full_settings_on_hover()
    {
        // Six configs from 2k to 486k parameters whose labels name four settings each.
        string[] configs = ["cell=gru;hidden=128;bidirectional=true;dropout=0.2", "cell=gru;hidden=64;bidirectional=false;dropout=0.2",
            "cell=lstm;hidden=128;bidirectional=true;dropout=0.1", "cell=lstm;hidden=256;bidirectional=false;dropout=0.2",
            "cell=rnn;hidden=128;bidirectional=true;dropout=0.3", "cell=lstm;hidden=512;bidirectional=true;dropout=0.3"];
        var wide = ComparisonRecord.Build(configs.Select((name, k) =>
            ComparisonVerdictTests.Run(name, Enumerable.Range(0, 130 + 3 * k), parameters: 2_000 * (long)Math.Pow(3, k))).ToArray());
        var (data, layout) = FigureChecks.Parse(ComparisonViews.AccuracyVsSize(wide));
        var byLabel = data.ToDictionary(t => t!["name"]!.GetValue<string>(), t => t!);
        Assert.EndsWith("right", byLabel["gru · h128 · bi · d0.2"]["textposition"]!.GetValue<string>());   // leftmost: the name extends inward
        Assert.EndsWith("left", byLabel["lstm · h512 · bi · d0.3"]["textposition"]!.GetValue<string>());   // rightmost
        // Six points spread over 2½ decades: every config finds a free place for its name, so no legend is needed.
        Assert.All(data, t => Assert.Equal("markers+text", t!["mode"]!.GetValue<string>()));
        Assert.False(layout["showlegend"]!.GetValue<bool>());
        Assert.Contains("cell=gru; hidden=128; bidirectional=true; dropout=0.2", byLabel["gru · h128 · bi · d0.2"]["hovertemplate"]!.GetValue<string>());
        var c = ComparisonVerdictTests.NarrowComparison();
        Assert.Equal("array", layout["xaxis"]!["tickmode"]!.GetValue<string>());
        // Summary table: the short label and the full settings side by side.
        string summary = ComparisonViews.Summary(c).ToHtml();
        Assert.Contains($"<td>{Html.Escape("gru · bi")}</td><td>cell=gru; embed=32; hidden=128; bidirectional=true</td>", summary);
    }
}
