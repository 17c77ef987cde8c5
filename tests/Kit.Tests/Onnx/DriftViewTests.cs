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

[Collection(global::Kit.Tests.Training.EngineRandomCollection.Name)]
public sealed class BundleDriftTests
{
    [Fact]
    public void Rows_like_the_profile_pass_and_word_notes_on_a_hostname_model_do_not()
    {
        var bundle = OnnxSamples.WithProfile(OnnxSamples.Bundle(new Kit.Models.ClassifierConfig(2, 2, EmbeddingSize: 8, HiddenSize: 6)));
        // The profile counted demo rows 600..899; rows 900..1199 come from the same generator.
        var like = BundleDrift.Check(bundle, OnnxSamples.Texts(1200).Skip(900).ToArray())!;
        Assert.DoesNotContain(like.Checks, c => c.Level == DriftLevel.Major);
        var notes = global::Kit.Data.TableReader.Read(Path.Combine(global::Kit.Tests.Experiments.KitCli.RepoRoot(), "data-demo", "maintenance-notes.csv"),
            new global::Kit.Data.ColumnSpec("text", "label")).Texts.Take(300).ToArray();
        var unlike = BundleDrift.Check(bundle, notes)!;
        Assert.Equal(DriftLevel.Major, unlike.Checks.Single(c => c.Aspect == "tokens per row" && c.Statistic == "PSI").Level);
        Assert.NotEqual(DriftLevel.None, unlike.Checks.Single(c => c.Aspect == "unknown tokens").Level);
        var noProfile = OnnxSamples.Bundle(new Kit.Models.ClassifierConfig(2, 2, EmbeddingSize: 4, HiddenSize: 4));
        Assert.Null(BundleDrift.Check(noProfile, notes));
    }
}
