using Kit.Data;
using Kit.Diagnostics;
using Kit.Views;

namespace Kit.Tests.Views;

/// <summary>A report with one of every view, built from <see cref="ViewSamples"/>.</summary>
internal static class ReportSamples
{
    public static IReadOnlyList<IView> AllViews()
    {
        var s = new ViewSamples();
        var table = s.Table();
        var profile = DatasetProfile.Compute(table, new CharacterTokenizer());
        var split = Splitter.StratifiedHoldout(table.LabelIds(), 0.6, 0.2, 0.2, 3, profile.RowLengths);
        var occlusion = ViewSamples.Occlusion(out var pieces);
        var vocab = Vocabulary.Build(split.Train.Select(i => new CharacterTokenizer().Split(table.Texts[i])));
        var coverage = Enumerable.Range(0, 3).Select(p => vocab.Coverage(split.Rows(p).Select(i => new CharacterTokenizer().Split(table.Texts[i])), Split.PartNames[p])).ToArray();
        return new IView[]
        {
            DataViews.Profile(profile),
            DataViews.Split(split.Summary, ViewSamples.Names),
            DataViews.Leakage(LeakageAudit.Run(table, split)),
            DataViews.Encoding(coverage, new TruncationReport(table.Count, 64, TruncationPolicy.KeepHead, 0, 0, 1000, 40, 0)),
            HistoryViews.Curves(ViewSamples.History()),
            MetricsViews.Summary(s.Metrics, HeadlineIntervals.Of(s.Metrics, 200, 3)),
            MetricsViews.PerClass(s.Metrics),
            MetricsViews.Confusion(s.Metrics, false),
            MetricsViews.Confusion(s.Metrics, true),
            LengthViews.Accuracy(s.ByLength()),
            LengthViews.ClassByBin(s.ByLength().ByClass),
            CalibrationViews.Reliability(s.Calibration()),
            CalibrationViews.Reliability(s.Calibration(BinningScheme.EqualMass)),
            CalibrationViews.PerClass(s.Calibration()),
            CalibrationViews.Temperature(s.Temperature(), s.Calibration(), s.Calibration()),
            ProjectionViews.Tokens(ViewSamples.Tokens()),
            ProjectionViews.Sequences(s.Sequences(ProjectionMethod.Tsne)),
            ErrorViews.Tables(s.Errors()),
            OcclusionViews.Tokens(occlusion, pieces, "alpha"),
        };
    }

    public static int ChartCount(IEnumerable<IView> views) => views.Sum(v => v is IChartView c ? c.ChartCount : 0);
}
