using Kit.Export;

namespace Kit.Tests.Export;

/// <summary>The layout audit the real-size browser tests rely on: each kind of problem is found, and a clean chart has none.</summary>
public class ChartLayoutTests
{
    static readonly TextBox Frame = new(0, 0, 500, 300);

    static ChartText Tick(string axis, string text, double x) => new("tick label", axis, text, new TextBox(x, 280, x + 20, 292));

    static ChartLayout Chart(IReadOnlyList<ChartText> ticks, IReadOnlyList<ChartText>? labels = null) =>
        new(0, "test chart", Frame, ticks, labels ?? []);

    [Fact]
    public void A_clean_chart_has_no_problems()
    {
        var chart = Chart([Tick("xtick", "84.5%", 50), Tick("xtick", "85.0%", 150), Tick("ytick", "85.0%", 10)],
            [new("chart title", "gtitle", "Accuracy", new TextBox(10, 5, 200, 20)), new("axis title", "xtitle", "test accuracy", new TextBox(200, 293, 300, 299))]);
        Assert.Empty(chart.Problems());
    }

    [Fact]
    public void Two_equal_tick_labels_on_one_axis_are_a_problem_but_equal_labels_on_two_axes_are_not()
    {
        var problems = Chart([Tick("xtick", "85%", 50), Tick("xtick", "85%", 150), Tick("xtick", "86%", 250), Tick("ytick", "86%", 10)]).Problems();
        var p = Assert.Single(problems);
        Assert.Contains("axis xtick shows the tick label '85%' 2 times", p);
    }

    [Fact]
    public void Overlapping_titles_are_a_problem_and_touching_ones_are_not()
    {
        var left = new ChartText("annotation", "annotation", "cell=gru;embed=32;hidden=128", new TextBox(10, 5, 210, 20));
        var overlapping = new ChartText("annotation", "annotation", "cell=lstm;embed=32;hidden=128", new TextBox(200, 5, 400, 20));
        var touching = new ChartText("annotation", "annotation", "rnn", new TextBox(210, 5, 260, 20));
        Assert.Single(Chart([], [left, overlapping]).Problems(), p => p.Contains("overlaps"));
        Assert.Empty(Chart([], [left, touching]).Problems());
    }

    [Fact]
    public void Text_past_the_chart_edge_is_reported_as_cut_off()
    {
        var problems = Chart([Tick("xtick", "cell=gru;embed=32;hidden=128;bidirectional=true", 490)]).Problems();
        Assert.Single(problems, p => p.Contains("cut off"));
    }

    /// <summary>A label of width w and height h drawn from (x, y) rotated by −45° (as slanted category labels are).</summary>
    static ChartText Slanted(string text, double x, double y, double w = 60, double h = 12)
    {
        double c = Math.Cos(-Math.PI / 4), s = Math.Sin(-Math.PI / 4);
        (double, double) P(double u, double v) => (x + u * c - v * s, y + u * s + v * c);
        var (x1, y1) = P(0, 0); var (x2, y2) = P(w, 0); var (x3, y3) = P(w, h); var (x4, y4) = P(0, h);
        return new ChartText("tick label", "xtick", text, new TextQuad(x1, y1, x2, y2, x3, y3, x4, y4), 12);
    }

    [Fact]
    public void Slanted_tick_labels_overlap_only_when_their_glyph_lines_do()
    {
        // 20 px apart along the axis, a 12 px tall line slanted at 45° covers 12·√2 ≈ 17 px of axis: no overlap,
        // though the upright boxes around them (42 × 51 px) overlap by more than half.
        var apart = Chart([Slanted("noun.artifact", 100, 200), Slanted("noun.attribute", 120, 200)]);
        Assert.True(apart.Ticks[0].Box.Right > apart.Ticks[1].Box.Left);
        Assert.Empty(apart.Problems());
        // 8 px apart they do.
        var crowded = Chart([Slanted("noun.artifact", 100, 200), Slanted("noun.attribute", 108, 200)]);
        Assert.Single(crowded.Problems(), p => p.Contains("draws tick labels over each other (1 overlapping pairs of 2 labels)"));
    }

    [Fact]
    public void Cell_numbers_drawn_over_each_other_and_tiny_text_are_problems()
    {
        var cells = Chart([Tick("xtick", "a", 50)], [
            new("cell label", "heatmap", "12", new TextBox(100, 100, 116, 112)),
            new("cell label", "heatmap", "0", new TextBox(110, 100, 118, 112)),
            new("cell label", "heatmap", "7", new TextBox(140, 100, 148, 112), fontPixels: 5)]).Problems();
        Assert.Contains(cells, p => p.Contains("1 pairs of cell numbers drawn over each other"));
        Assert.Contains(cells, p => p.Contains("1 texts smaller than 8 px (smallest 5.0 px"));
    }

    [Fact]
    public void A_title_over_tick_labels_is_a_problem()
    {
        var problems = Chart([Tick("xtick", "85%", 50)], [new("annotation", "annotation", "lstm · bi", new TextBox(40, 285, 90, 296))]).Problems();
        Assert.Single(problems, p => p.Contains("is drawn over 1 tick label(s) of axis xtick"));
    }
}
