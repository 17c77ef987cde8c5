using Kit.Experiments;
using Kit.Views;

namespace Kit.Tests.Views;

/// <summary>Every public result record shows itself through the registry, drawn from its own numbers.</summary>
public class RecordViewsTests(SmallRun small) : IClassFixture<SmallRun>
{
    readonly RunOutcome _run = small.Run;
    readonly RunDiagnostics _d = small.Diagnostics;

    IView ViewOf(object record)
    {
        Assert.True(ViewRegistry.TryGetView(record, out var view), $"no view for {record.GetType().Name}");
        Assert.False(string.IsNullOrWhiteSpace(view!.ToHtml()), $"{record.GetType().Name}'s view is empty");
        return view;
    }

    [Fact]
    public void Each_result_record_has_a_view_that_renders_its_own_numbers()
    {
        var report = RunReport.Of(_run, _d);
        object[] records =
        [
            _run.Data, _run.Fold, _run.Split, _d.Profile, _d.Split, _d.Leakage, _d.Coverage[2], _run.Truncation, _run.History, _run.TestMetrics,
            _d.ByLength, _d.ByLength.ByClass, _d.Calibration, _d.Temperature, _d.Embedding!, _d.TestRepresentations!, _d.Errors,
            _d.Occlusions[0], _run, _d, report, report.Calibration,
        ];
        foreach (var r in records) ViewOf(r);
        Assert.True(ViewRegistry.Types.Count >= 20, $"only {ViewRegistry.Types.Count} record types have views");

        string metrics = ViewOf(_run.TestMetrics).ToHtml();
        Assert.Contains("Headline metrics on the test split", metrics);
        Assert.Contains(Html.Pct(_run.TestMetrics.Accuracy), metrics);

        // The temperature report carries its before/after calibration, so it draws the comparison alone.
        var temperature = ViewOf(_d.Temperature);
        Assert.Equal("Temperature scaling", temperature.Title);
        Assert.Equal(1, ((IChartView)temperature).ChartCount);
        Assert.Contains(Html.Pct(_d.Temperature.After!.ClasswiseEce), temperature.ToHtml());

        // A split summary carries its class names.
        string split = ViewOf(_d.Split).ToHtml();
        Assert.All(_run.Labels.Names, n => Assert.Contains(n, split));

        // The run's outcome is a short summary naming its report sections.
        string outcome = ViewOf(_run).ToHtml();
        Assert.Contains(Html.Pct(_run.TestMetrics.Accuracy), outcome);
        Assert.All(RunReport.SectionNames, n => Assert.Contains("report." + char.ToUpperInvariant(n[0]) + n[1..], outcome));

        // Token maps and sequence maps are told apart by what their points carry.
        Assert.Equal("Projection of token embeddings", ViewOf(_d.Embedding!).Title);
        Assert.Equal("Projection of pooled test representations", ViewOf(_d.TestRepresentations!).Title);

        // The whole report holds every section's charts.
        Assert.Equal(ReportSamples.ChartCount(report.Views), ((IChartView)ViewOf(report)).ChartCount);
    }
}
