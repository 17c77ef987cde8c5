using System.Globalization;
using Kit.Experiments;
using Kit.Training;

namespace Kit.Views;

/// <summary>
/// The report of one run as a value: named sections in reading order — setup, data, split, leakage, training,
/// scores, length, calibration, maps, errors, occlusion — each displayable on its own (<c>report.Calibration</c>
/// or <c>report["calibration"]</c>) or the whole report at once, and written to one HTML file by
/// <see cref="Write"/>. Every diagnostic is on the test part; temperature is fitted on validation.
/// </summary>
public sealed class RunReport
{
    /// <summary>Section names, in reading order.</summary>
    public static readonly IReadOnlyList<string> SectionNames =
        ["setup", "data", "split", "leakage", "training", "scores", "length", "calibration", "maps", "errors", "occlusion"];

    readonly Dictionary<string, ReportSection> _byName;

    public string Title { get; }
    public string Subtitle { get; }
    public IReadOnlyList<ReportSection> Sections { get; }
    public RunOutcome Run { get; }
    public RunDiagnostics Diagnostics { get; }

    RunReport(string title, string subtitle, IReadOnlyList<ReportSection> sections, RunOutcome run, RunDiagnostics diagnostics)
    {
        Title = title;
        Subtitle = subtitle;
        Sections = sections;
        Run = run;
        Diagnostics = diagnostics;
        _byName = sections.ToDictionary(s => s.Name, StringComparer.OrdinalIgnoreCase);
    }

    /// <summary>The section called <paramref name="name"/> (one of <see cref="SectionNames"/>).</summary>
    public ReportSection this[string name] => _byName.TryGetValue(name, out var s) ? s
        : throw new KeyNotFoundException($"no report section '{name}'; the sections are {string.Join(", ", SectionNames)}");

    public ReportSection Setup => this["setup"];
    public ReportSection Data => this["data"];
    public ReportSection Split => this["split"];
    public ReportSection Leakage => this["leakage"];
    public ReportSection Training => this["training"];
    public ReportSection Scores => this["scores"];
    public ReportSection Length => this["length"];
    public ReportSection Calibration => this["calibration"];
    public ReportSection Maps => this["maps"];
    public ReportSection Errors => this["errors"];
    public ReportSection Occlusion => this["occlusion"];

    /// <summary>Every view of every section, in reading order.</summary>
    public IReadOnlyList<IView> Views => Sections.SelectMany(s => s.Views).ToArray();

    /// <summary>Writes the whole report as one self-contained HTML file (plotly.js embedded once).</summary>
    public void Write(string path) => ReportWriter.Write(path, Title, Subtitle, Views);

    /// <summary>The report of <paramref name="run"/>; computes the diagnostics (budget from the run's spec) when none are given.</summary>
    public static RunReport Of(RunOutcome run, RunDiagnostics? diagnostics = null, string? title = null, string? subtitle = null,
        IProgress<string>? stages = null)
    {
        ArgumentNullException.ThrowIfNull(run);
        var d = diagnostics ?? RunDiagnostics.Compute(run, run.Spec.Diagnostics, stages);
        var inv = CultureInfo.InvariantCulture;
        title ??= $"{run.Spec.EncoderName.ToUpperInvariant()} classifier — {Path.GetFileName(run.Table.SourcePath)}";
        subtitle ??= $"Test part: accuracy {run.TestMetrics.Accuracy.ToString("P1", inv)}, macro F1 {run.TestMetrics.MacroF1.ToString("F3", inv)}.";

        var sections = new List<ReportSection>
        {
            new("setup", "Run setup", [new TextView("Run setup", SetupTable(run, d))]),
            new("data", "Data", [DataViews.Profile(d.Profile)]),
            new("split", "Split and vocabulary", [DataViews.Split(d.Split), DataViews.Encoding(d.Coverage, run.Truncation)]),
            new("leakage", "Leakage audit", [DataViews.Leakage(d.Leakage)]),
            new("training", "Training", [HistoryViews.Curves(run.History)]),
            new("scores", "Test scores", ManyClassViews.Scores(run.TestMetrics, d.TestIntervals)),
            new("length", "Accuracy by length", [LengthViews.Accuracy(d.ByLength), LengthViews.ClassByBin(d.ByLength.ByClass)]),
            new("calibration", "Calibration",
            [
                CalibrationViews.Reliability(d.Calibration), CalibrationViews.Reliability(d.CalibrationEqualMass),
                .. ManyClassViews.Reliability(d.Calibration), CalibrationViews.Temperature(d.Temperature),
            ]),
            new("maps", "Embedding and representation maps", MapViews(run, d)),
            new("errors", "Errors", [ErrorViews.Tables(d.Errors)]),
            new("occlusion", "Occlusion", d.Occlusions.Count > 0
                ? d.Occlusions.Select(OcclusionViews.Case).ToArray()
                : [TextView.Paragraph("Occlusion", "No test row was explained (the diagnostics budget asked for none, or no row has tokens).")]),
        };
        return new RunReport(title, subtitle, sections, run, d);
    }

    static IReadOnlyList<IView> MapViews(RunOutcome run, RunDiagnostics d)
    {
        var views = new List<IView>();
        if (d.Embedding is not null) views.Add(ProjectionViews.Tokens(d.Embedding));
        views.Add(d.TestRepresentations is not null
            ? ProjectionViews.Sequences(d.TestRepresentations)
            : TextView.Paragraph("Projection of pooled test representations",
                $"Not drawn: the test part has {run.Test.Count} rows and the budget allows {d.Options.ProjectionMaxPoints}; at least {RunDiagnostics.MinProjectedRows} are needed."));
        return views;
    }

    static string SetupTable(RunOutcome run, RunDiagnostics d)
    {
        var s = run.Spec;
        var t = s.Training;
        var inv = CultureInfo.InvariantCulture;
        var f = run.Fold;
        return Html.Table(new[] { "item", "value" }, new[]
        {
            new[] { "data", $"{Path.GetFileName(run.Table.SourcePath)} — {run.Rows.Length} rows used of {run.Table.Count}, {run.Labels.Count} classes" },
            new[] { "split", $"{run.Data.SplitDescription}: {f.Split.Train.Length}/{f.Split.Validation.Length}/{f.Split.Test.Length} rows" },
            new[] { "tokens", $"{run.Tokenizer.Name}, vocabulary {run.Vocabulary.Count} ids from the training part only (pad = 0, unknown = 1), max length {run.Data.Options.MaxLength}" },
            new[] { "model", $"{Kit.Models.ModelDescription.Of(run.Config)}; {run.Model.ParameterCount().ToString("N0", inv)} parameters" },
            new[] { "training", $"{run.History.Epochs.Count} epochs, batch {t.BatchSize}, {Optimiser(t)}, schedule {t.Schedule.Kind}, seed {t.Seed}; best epoch {run.History.BestEpoch}{(run.History.StopReason is null ? "" : "; " + run.History.StopReason)}" },
            new[] { "time", $"{run.Elapsed.TotalSeconds.ToString("F1", inv)} s to train and score, {d.Elapsed.TotalSeconds.ToString("F1", inv)} s for the diagnostics, on {Environment.ProcessorCount} cores" },
        }, numericRight: false);
    }

    /// <summary>The optimiser that actually ran, with the settings that matter for it.</summary>
    internal static string Optimiser(TrainingOptions t)
    {
        var inv = CultureInfo.InvariantCulture;
        string name = t.Optimizer switch
        {
            OptimizerKind.Adam => "Adam",
            OptimizerKind.AdamW => "AdamW",
            OptimizerKind.Sgd => $"SGD (momentum {t.Momentum.ToString(inv)})",
            _ => t.Optimizer.ToString(),
        };
        string decay = t.WeightDecay > 0 ? $", weight decay {t.WeightDecay.ToString(inv)}" : "";
        return $"{name} lr {t.LearningRate.ToString(inv)}{decay}";
    }

    public override string ToString() => $"{Title}: {string.Join(", ", SectionNames)}";
}
