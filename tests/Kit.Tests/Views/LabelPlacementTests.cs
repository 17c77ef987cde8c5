using Kit.Views;

namespace Kit.Tests.Views;

public class LabelPlacementTests
{
    [Fact]
    public void A_lone_point_gets_its_name_above_it()
    {
        Assert.Equal("top center", Assert.Single(LabelPlacement.Place([(200, 100)], [80], 16, 400, 200)));
    }

    [Fact]
    public void Two_close_points_get_names_that_do_not_overlap_and_the_first_keeps_its_first_choice()
    {
        // 30 px apart on one level: both names cannot sit above (each 100 px wide).
        var placed = LabelPlacement.Place([(200, 100), (230, 100)], [100, 100], 16, 400, 200);
        Assert.Equal("top center", placed[0]);
        Assert.Equal("bottom center", placed[1]);
    }

    [Fact]
    public void A_name_that_would_leave_the_plot_turns_inward()
    {
        // Near the right edge a 120 px name centred on the point would pass the edge.
        var placed = LabelPlacement.Place([(390, 100)], [120], 16, 400, 200);
        Assert.Equal("middle left", placed[0]);
    }

    [Fact]
    public void A_point_boxed_in_on_every_side_gets_no_label_rather_than_an_overlapping_one()
    {
        var pts = new List<(double, double)> { (200, 100) };
        foreach (var (dx, dy) in new[] { (0, -20), (0, 20), (40, 0), (-40, 0), (40, -20), (-40, -20), (40, 20), (-40, 20) })
            pts.Add((200 + dx, 100 + dy));
        var placed = LabelPlacement.Place(pts.Skip(1).Append(pts[0]).ToList(), Enumerable.Repeat(60.0, pts.Count).ToList(), 16, 400, 200);
        Assert.Null(placed[^1]);
    }
}
