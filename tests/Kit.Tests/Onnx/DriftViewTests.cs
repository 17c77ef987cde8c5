using Kit.Diagnostics;
using Kit.Tests.Views;
using Kit.Training;
using Kit.Views;

namespace Kit.Tests.Onnx;

public sealed class DriftViewTests
{
    [Fact]
    public void The_view_draws_every_histogram_on_titled_axes_and_lists_every_check()
    {
        var profile = TrainingProfile.From(10, new[] { 3, 4, 4, 5, 9, 12 }, 30, 1, new[] { "p", "q" }, new[] { 0, 1, 1 },
            new[] { new[] { 0.8, 0.2 }, new[] { 0.4, 0.6 }, new[] { 0.1, 0.9 } });
        var report = DriftReport.Compute(profile, new[] { 20, 22, 25 }, 30, 9, new[] { 0.55, 0.6, 0.5 }, new[] { 0, 0, 0 });
        var view = DriftViews.View(report);
        var chart = Assert.Single(StackView.ChartsIn(new IView[] { view }));
        FigureChecks.HasTitledAxes(chart);
        var (data, _) = FigureChecks.Parse(chart);
        Assert.Equal(2 * report.Histograms.Count, data.Count);
        Assert.Equal(report.Histograms[0].Scored.Select(v => (double?)v), FigureChecks.Numbers(data[1]!["y"]));
        string html = view.ToHtml();
        foreach (var check in report.Checks) Assert.Contains(Html.Escape(check.Verdict), html);
        Assert.Contains("major shift", FigureChecks.Title(chart));
    }
}
