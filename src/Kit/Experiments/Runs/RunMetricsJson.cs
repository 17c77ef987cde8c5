using System.Text.Json;
using System.Text.Json.Nodes;
using Kit.Diagnostics;

namespace Kit.Experiments;

/// <summary>
/// metrics.json holds only numbers that the seed and data decide — no times, dates, paths beyond the file name, or
/// resume history — so two runs can be compared byte for byte. timings.json holds the rest.
/// </summary>
public static class RunMetricsJson
{
    static readonly JsonSerializerOptions Indented = new() { WriteIndented = true };

    static JsonNode? Num(double x) => double.IsFinite(x) ? JsonValue.Create(x) : null;

    public static string Metrics(RunOutcome run, RunDiagnostics diagnostics)
    {
        double? temperature = diagnostics.Temperature.Temperature;
        var s = run.Spec;
        var m = run.TestMetrics;
        var names = m.ClassNames;
        var confusion = new JsonArray();
        for (int i = 0; i < names.Count; i++)
        {
            var row = new JsonArray();
            for (int j = 0; j < names.Count; j++) row.Add(m.Confusion[i, j]);
            confusion.Add(row);
        }
        // The headline numbers of the test split under stable snake_case names, for scripts that diff runs.
        double ece = diagnostics.Calibration.Ece, eceAfter = diagnostics.CalibrationAfterScaling.Ece;
        var root = new JsonObject
        {
            ["format"] = "kit-metrics",
            ["version"] = 1,
            ["accuracy"] = Num(m.Accuracy),
            ["macro_f1"] = Num(m.MacroF1),
            ["log_loss"] = Num(m.LogLoss),
            ["brier"] = Num(m.Brier),
            ["ece"] = Num(ece),
            ["temperature"] = temperature is double t0 ? Num(t0) : null,
            ["ece_after_temperature"] = Num(eceAfter),
            ["data"] = new JsonObject
            {
                ["file"] = Path.GetFileName(run.Table.SourcePath),
                ["rows"] = run.Table.Count,
                ["rowsUsed"] = run.Rows.Length,
                ["classes"] = new JsonArray(names.Select(n => (JsonNode?)JsonValue.Create(n)).ToArray()),
                ["split"] = new JsonObject { ["train"] = run.Split.Train.Length, ["validation"] = run.Split.Validation.Length, ["test"] = run.Split.Test.Length, ["seed"] = run.Data.Options.SplitSeed, ["method"] = run.Data.SplitDescription },
                ["tokenizer"] = run.Tokenizer.Name,
                ["vocabulary"] = run.Vocabulary.Count,
                ["maxLength"] = run.Data.Options.MaxLength,
            },
            ["model"] = JsonNode.Parse(run.Config.ToJson()),
            ["parameters"] = run.Model.ParameterCount(),
            ["training"] = JsonSerializer.SerializeToNode(s.Training with { CheckpointDirectory = null, Resume = false },
                new JsonSerializerOptions { Converters = { new System.Text.Json.Serialization.JsonStringEnumConverter() } }),
            ["threads"] = TorchSharp.torch.get_num_threads(),
            ["history"] = new JsonArray(run.History.Epochs.Select(e => (JsonNode?)new JsonObject
            {
                ["epoch"] = e.Epoch,
                ["trainLoss"] = Num(e.TrainLoss),
                ["trainAccuracy"] = Num(e.TrainAccuracy),
                ["validationLoss"] = Num(e.ValidationLoss),
                ["validationAccuracy"] = Num(e.ValidationAccuracy),
                ["validationMacroF1"] = Num(e.ValidationMacroF1),
                ["learningRate"] = Num(e.LearningRate),
                ["meanGradientNorm"] = Num(e.MeanGradientNorm),
                ["clippedBatches"] = e.ClippedBatches,
            }).ToArray()),
            ["bestEpoch"] = run.History.BestEpoch,
            ["monitor"] = run.History.Monitor.ToString(),
            ["stop"] = run.History.Stop.ToString(),
            ["stopReason"] = run.History.StopReason,
            ["test"] = new JsonObject
            {
                ["count"] = m.Count,
                ["accuracy"] = Num(m.Accuracy),
                ["balancedAccuracy"] = Num(m.BalancedAccuracy),
                ["macroF1"] = Num(m.MacroF1),
                ["microF1"] = Num(m.MicroF1),
                ["weightedF1"] = Num(m.WeightedF1),
                ["logLoss"] = Num(m.LogLoss),
                ["brier"] = Num(m.Brier),
                ["perClass"] = new JsonArray(m.PerClass.Select(c => (JsonNode?)new JsonObject
                {
                    ["class"] = c.Class, ["precision"] = Num(c.Precision), ["recall"] = Num(c.Recall), ["f1"] = Num(c.F1),
                    ["trueRows"] = c.TrueRows, ["predictedRows"] = c.PredictedRows,
                }).ToArray()),
                ["confusion"] = confusion,
            },
            ["calibration"] = new JsonObject
            {
                ["temperature"] = temperature is double t ? Num(t) : null,
                ["fittedOn"] = "validation",
                ["testLogLossCalibrated"] = temperature is double t2 && run.Test.Count > 0
                    ? Num(TemperatureScaling.NegativeLogLikelihood(run.TestLogits, run.Test.Labels, t2)) : null,
            },
        };
        return root.ToJsonString(Indented) + "\n";
    }

    public static string Timings(RunOutcome run) => new JsonObject
    {
        ["format"] = "kit-timings",
        ["version"] = 1,
        ["totalSeconds"] = run.Elapsed.TotalSeconds,
        ["cores"] = Environment.ProcessorCount,
        ["threads"] = TorchSharp.torch.get_num_threads(),
        ["resumedAfterEpoch"] = run.History.ResumedAfterEpoch,
        ["epochs"] = new JsonArray(run.History.Epochs.Select(e => (JsonNode?)new JsonObject
        {
            ["epoch"] = e.Epoch, ["seconds"] = e.Seconds, ["sequencesPerSecond"] = e.SequencesPerSecond,
        }).ToArray()),
    }.ToJsonString(Indented) + "\n";
}
