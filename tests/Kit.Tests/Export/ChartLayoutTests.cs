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
}
