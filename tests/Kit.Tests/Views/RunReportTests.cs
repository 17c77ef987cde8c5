using Kit.Data;
using Kit.DemoData;
using Kit.Diagnostics;
using Kit.Experiments;
using Kit.Training;
using Kit.Views;

namespace Kit.Tests.Views;

/// <summary>
/// One small real run (engine, invented demo hostnames) shared by the tests below: the diagnostics computed
/// from it must agree with the run's own numbers, and its report must hold every view.
/// </summary>
public sealed class SmallRun
{
    public RunOutcome Run { get; }
    public RunDiagnostics Diagnostics { get; }

    public SmallRun()
    {
        Kit.Native.Engine.EnsureLoaded();
        var rows = HostnameGenerator.Generate().ToArray();
        var table = new LabelledTable("demo-hostnames", rows.Select(r => r.Text).ToArray(), rows.Select(r => r.Label).ToArray(), rows.Select(r => r.Group).ToArray());
        var spec = new RunSpec
        {
            DataPath = "demo-hostnames",
            SampleRows = 900,
            MaxLength = 24,   // short enough that some rows are cut, so both piece paths of occlusion are used
            EmbeddingSize = 8,
            HiddenSize = 16,
            Training = new TrainingOptions { Epochs = 2, BatchSize = 64, LearningRate = 5e-3, Seed = 3 },
            Diagnostics = new DiagnosticsOptions { ProjectionMaxPoints = 60, TsneIterations = 150, BootstrapReplicates = 40, ErrorRows = 5 },
        };
        Run = SingleRun.Execute(spec, table);
        Diagnostics = RunDiagnostics.Compute(Run);
    }
}

public class RunReportTests(SmallRun small) : IClassFixture<SmallRun>
{
    readonly RunOutcome _run = small.Run;
    readonly RunDiagnostics _d = small.Diagnostics;

    [Fact]
    public void Length_bins_use_token_lengths_before_truncation_of_exactly_the_test_rows()
    {
        var texts = _run.TestTexts();
        Assert.Equal(texts.Select(t => _run.Tokenizer.Split(t).Count), _d.TestLengths);
        Assert.Equal(_run.Test.Count, _d.ByLength.Rows.Sum(r => r.Count));
        Assert.Equal((int)Math.Round(_run.TestMetrics.Accuracy * _run.Test.Count), _d.ByLength.Rows.Sum(r => r.Correct));
        Assert.Contains(_d.TestLengths, l => l > _run.Spec.MaxLength);
    }

    [Fact]
    public void Data_records_describe_the_rows_the_run_used()
    {
        Assert.Equal(_run.Rows.Length, _d.Profile.Rows);
        Assert.Equal(new[] { _run.Split.Train.Length, _run.Split.Validation.Length, _run.Split.Test.Length }, _d.Split.Parts.Select(p => p.Rows));
        Assert.Equal(_run.Split.Test.Select(i => _d.Profile.RowLengths[i]).Max(), _d.Split.Parts[2].Lengths.Max);
        // The run split by group, so no group may cross parts.
        Assert.Equal(0, _d.Leakage[LeakFinding.GroupAcrossParts].Rows);
        Assert.Equal(Split.PartNames, _d.Coverage.Select(c => c.Part));
    }

    [Fact]
    public void Calibration_records_are_on_the_test_split_and_temperature_is_fitted_on_validation()
    {
        Assert.Equal(_run.Test.Count, _d.Calibration.BinCounts.Sum());
        Assert.Equal(_run.Test.Count, _d.CalibrationEqualMass.BinCounts.Sum());
        Assert.Equal(BinningScheme.EqualMass, _d.CalibrationEqualMass.Scheme);
        double t = TemperatureScaling.Fit(_run.ValidationLogits, _run.Validation.Labels);
        Assert.Equal(t, _d.Temperature.Temperature, 12);
        Assert.Equal(_d.Temperature.TestEceAfter, _d.CalibrationAfterScaling.Ece, 12);
        Assert.Equal(_run.TestMetrics.Accuracy, _d.Temperature.TestAccuracy, 12);
    }

    [Fact]
    public void Projections_cover_the_vocabulary_and_a_sample_of_the_test_rows()
    {
        Assert.NotNull(_d.Embedding);
        Assert.Equal(_run.Vocabulary.Count - 1, _d.Embedding!.Points.Count);
        Assert.Equal(_run.Vocabulary.Tokens.Skip(1), _d.Embedding.Points.Select(p => p.Text));
        Assert.NotNull(_d.TestRepresentations);
        var points = _d.TestRepresentations!.Points;
        Assert.InRange(points.Count, 60 - 2 * _run.Labels.Count, 60);
        var texts = _run.TestTexts().ToHashSet();
        Assert.All(points, p => Assert.Contains(p.Text!, texts));
        Assert.Equal(ProjectionMethod.Tsne, _d.TestRepresentations.Method);
    }

    [Fact]
    public void Pooled_vectors_through_the_head_give_the_runs_logits()
    {
        // The head is one linear layer on the pooled vector, so logits must be an affine map of it: check by
        // least squares that the run's logits are reproduced from Pooled (a wrong row order would break this).
        var subset = _run.Test.Subset(Enumerable.Range(0, 40).ToArray());
        var pooled = ModelReadout.Pooled(_run.Model, subset);
        Assert.Equal(40, pooled.Length);
        Assert.Equal(_run.Config.PooledSize, pooled[0].Length);
        var logits = Kit.Training.Scoring.Logits(_run.Model, subset);
        Assert.Equal(Kit.Models.HeadKind.Linear, _run.Config.Head);
        var parameters = _run.Model.named_parameters().ToDictionary(p => p.name, p => p.parameter);
        var w = parameters["head.linear.weight"];
        var b = parameters["head.linear.bias"];
        var wd = w.to(TorchSharp.torch.ScalarType.Float64).data<double>().ToArray();
        var bd = b.to(TorchSharp.torch.ScalarType.Float64).data<double>().ToArray();
        int h = pooled[0].Length;
        for (int i = 0; i < 40; i++)
            for (int k = 0; k < _run.Labels.Count; k++)
            {
                double z = bd[k];
                for (int j = 0; j < h; j++) z += wd[k * h + j] * pooled[i][j];
                Assert.Equal(logits[i][k], z, 4);
            }
    }

    [Fact]
    public void Occlusion_cases_start_from_the_runs_own_probabilities()
    {
        Assert.NotEmpty(_d.Occlusions);
        var texts = _run.TestTexts();
        foreach (var c in _d.Occlusions)
        {
            int row = Array.IndexOf(texts, c.Text);
            Assert.True(row >= 0);
            int predicted = _run.TestMetrics.Predicted[row];
            Assert.Equal(_run.Labels.Names[predicted], c.TargetClass);
            Assert.Equal(_run.TestProbabilities[row][predicted], c.Result.BaseProbability, 5);
            Assert.Equal(_run.Test.Length(row), c.Pieces.Count);
            Assert.Equal(c.Result.Tokens.Select(t => t == Vocabulary.UnknownId), c.Unknown);
        }
        var mistake = _d.Occlusions.FirstOrDefault(c => c.TrueClass != c.PredictedClass);
        if (mistake is not null) Assert.Contains(mistake.Text, _d.Errors.SureMistakes.Take(5).Select(e => e.Text));
    }

    [Fact]
    public void Occlusion_picks_a_sure_mistake_a_narrow_right_call_and_a_sure_right_call_that_show_something()
    {
        Assert.Equal(3, _d.Occlusions.Count);
        Assert.Equal(_d.Occlusions.Count, _d.Occlusions.Select(c => c.Text).Distinct().Count());
        var narrow = Assert.Single(_d.Occlusions, c => c.Why.Contains("narrowest margin", StringComparison.Ordinal));
        var sure = Assert.Single(_d.Occlusions, c => c.Why.Contains("highest confidence", StringComparison.Ordinal) && c.TrueClass == c.PredictedClass);
        Assert.Equal(narrow.TrueClass, narrow.PredictedClass);
        Assert.True(narrow.Result.BaseProbability < sure.Result.BaseProbability);
        // Every shown row shows a log-odds drop that prints as non-zero, the confident one included (its drops in p may
        // all print as 0.000). How large depends on the model; the floor of a "non-trivial" pick is tried, not promised.
        foreach (var c in _d.Occlusions)
        {
            double largest = c.Result.Positions.Max(p => Math.Abs(p.LogOddsDrop));
            Assert.NotEqual("0.00", Html.Num(largest, 2));
            Assert.Contains($"<td class=\"num\">{Html.Num(c.Result.Positions.MaxBy(p => Math.Abs(p.LogOddsDrop))!.LogOddsDrop, 2)}</td>", OcclusionViews.Case(c).ToHtml());
        }
        string html = OcclusionViews.Case(sure).ToHtml();
        Assert.Contains("log p − log(1 − p)", html);
        Assert.Contains("log-odds drop", html);
    }

    [Fact]
    public void The_run_report_holds_every_view_and_renders()
    {
        var report = RunReport.Of(_run, _d);
        var views = report.Views;
        Assert.Equal(RunReport.SectionNames, report.Sections.Select(s => s.Name));
        Assert.Equal(views, report.Sections.SelectMany(s => s.Views));
        // Sections are reached by name, never by position: each holds the views its name promises.
        Assert.Equal(["Training history"], report.Training.Views.Select(v => v.Title));
        Assert.Same(report.Calibration, report["CALIBRATION"]);
        Assert.All(report.Occlusion.Views, v => Assert.StartsWith("Occlusion: why", v.Title));
        Assert.Throws<KeyNotFoundException>(() => report["scoring"]);
        string[] expected =
        {
            "Run setup", "Dataset profile", "Split summary", "Vocabulary and truncation", "Leakage audit", "Training history",
            "Metrics (test split)", "Per-class precision, recall and F1", "Confusion matrix (counts)", "Confusion matrix (normalised)",
            "Accuracy by length", "Recall by class and length", "Reliability (equal-width)", "Reliability (equal-mass)", "Per-class reliability",
            "Temperature scaling", "Projection of token embeddings", "Projection of pooled test representations", "Error analysis",
        };
        Assert.Equal(expected, views.Take(expected.Length).Select(v => v.Title));
        Assert.All(views.Skip(expected.Length), v => Assert.StartsWith("Occlusion: why", v.Title));
        int charts = ReportSamples.ChartCount(views);
        Assert.Equal(15, charts);   // profile 2, split 1, history 1, per-class 1, confusion 2, length 2, reliability 3, temperature 1, projections 2
        foreach (var chart in StackView.ChartsIn(views)) FigureChecks.HasTitledAxes(chart);
        string page = ReportWriter.Render("Small run", "invented demo hostnames, 2 epochs", views);
        Assert.Contains($"data-kit-charts=\"{charts}\"", page);
        File.WriteAllText(Path.Combine(Kit.Tests.Export.BrowserTests.ArtifactFolder(), "run-report.html"), page);   // for a person to look at
    }
}
