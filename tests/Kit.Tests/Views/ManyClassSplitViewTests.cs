using System.Text.Json.Nodes;
using Kit.Data;
using Kit.Views;

namespace Kit.Tests.Views;

/// <summary>
/// The class-share chart of the split at 45 classes (synthetic labels with uneven counts): horizontal bars, classes
/// largest first, every name on the axis and a left margin that fits the longest; the 7-class form stays upright.
/// </summary>
public class ManyClassSplitViewTests
{
    static (SplitSummary Summary, string[] Names, int[] Counts) FortyFiveClasses()
    {
        var names = Enumerable.Range(0, 45).Select(c => c % 3 == 0 ? $"noun.category-{c:D2}-with-a-long-name" : $"class-{c:D2}").ToArray();
        // Class c has 5 + (c·37 mod 90) rows, so sizes are uneven and out of name order.
        var counts = Enumerable.Range(0, 45).Select(c => 5 + c * 37 % 90).ToArray();
        var labels = counts.SelectMany((n, c) => Enumerable.Repeat(c, n)).ToArray();
        var rows = Enumerable.Range(0, labels.Length).ToArray();
        var summary = SplitSummary.Of("stratified holdout", 7, labels, null,
            ("train", rows.Where(r => r % 5 < 3).ToArray()), ("validation", rows.Where(r => r % 5 == 3).ToArray()), ("test", rows.Where(r => r % 5 == 4).ToArray()));
        return (summary, names, counts);
    }

    [Fact]
    public void Forty_five_classes_are_drawn_as_horizontal_bars_largest_class_first_with_room_for_every_name()
    {
        var (summary, names, counts) = FortyFiveClasses();
        var chart = StackView.ChartsIn([DataViews.Split(summary, names)]).Single();
        FigureChecks.HasTitledAxes(chart);
        var (data, layout) = FigureChecks.Parse(chart);
        Assert.Equal(3, data.Count);
        foreach (var trace in data)
        {
            Assert.Equal("h", trace!["orientation"]!.GetValue<string>());
            var shown = trace["y"]!.AsArray().Select(n => n!.GetValue<string>()).ToArray();
            Assert.Equal(names.OrderBy(n => n).ToArray(), shown.OrderBy(n => n).ToArray());
            // Largest class first, then by total rows descending.
            var totals = shown.Select(n => counts[Array.IndexOf(names, n)]).ToArray();
            Assert.Equal(totals.OrderByDescending(t => t).ToArray(), totals);
        }
        Assert.Equal("reversed", layout["yaxis"]!["autorange"]!.GetValue<string>());
        int longest = names.Max(n => n.Length);
        Assert.True(layout["margin"]!["l"]!.GetValue<int>() >= 6 * longest, $"left margin {layout["margin"]!["l"]} for names of {longest} characters");
        Assert.True(layout["height"]!.GetValue<int>() >= 45 * 12, "each class needs a row of bars");
    }

    [Fact]
    public void Seven_classes_keep_the_upright_grouped_bars()
    {
        var names = FortyFiveClasses().Names;
        var seven = SplitSummary.Of("stratified holdout", 7, Enumerable.Range(0, 70).Select(i => i % 7).ToArray(), null,
            ("train", Enumerable.Range(0, 42).ToArray()), ("test", Enumerable.Range(42, 28).ToArray()));
        var chart = StackView.ChartsIn([DataViews.Split(seven, names[..7])]).Single();
        var (data, _) = FigureChecks.Parse(chart);
        Assert.All(data, t => Assert.Equal("v", t!["orientation"]!.GetValue<string>()));
        Assert.Equal(names[..7], data[0]!["x"]!.AsArray().Select(n => n!.GetValue<string>()).ToArray());
    }
}
