using Kit.Experiments;

namespace Kit.Views;

/// <summary>The views of a sweep's comparison report, in reading order.</summary>
public static class ComparisonReport
{
    public static IReadOnlyList<IView> Views(ComparisonRecord c) =>
    [
        ComparisonViews.Verdict(c),
        ComparisonViews.Summary(c),
        .. SearchViews.For(c),
        ComparisonViews.AccuracyByConfig(c),
        ComparisonViews.Paired(c),
        ComparisonViews.AccuracyVsSize(c),
        ComparisonViews.LearningCurves(c),
        ComparisonViews.AccuracyByLength(c),
        ComparisonViews.CalibrationSideBySide(c),
    ];

    /// <summary>Writes DIR/report.html from the runs the store holds.</summary>
    public static string Write(string dir, ComparisonRecord c, string dataName)
    {
        string path = Path.Combine(dir, "report.html");
        var best = c.Best;
        ReportWriter.Write(path, $"Comparison — {dataName}",
            $"{c.Configs.Count} configs, {c.Runs} runs. Best: {best.Label}, mean test accuracy {Html.Pct(best.Accuracy.Mean)}.",
            Views(c));
        return path;
    }
}
