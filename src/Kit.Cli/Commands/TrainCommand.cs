using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using Kit.Common;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Experiments;
using Kit.Models;
using Kit.Training;
using Kit.Views;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit train DATA …`: split, train with a checkpoint per epoch, then write the model bundle, metrics.json (numbers
/// only, comparable byte for byte between runs), timings.json, report.html and checkpoints/ into --out.
/// </summary>
internal static class TrainCommand
{
    public static Command Build()
    {
        var data = new Argument<string>("DATA") { Description = "Labelled rows (.csv, .tsv, .jsonl)" };
        var text = new Option<string>("--text") { Description = "Text column", DefaultValueFactory = _ => "text" };
        var label = new Option<string>("--label") { Description = "Label column", DefaultValueFactory = _ => "label" };
        var group = new Option<string?>("--group") { Description = "Group column: rows sharing a value stay in one split part" };
        var tokenizer = Choice("--tokenizer", "Token unit", "character", "character", "byte", "word");
        var maxLength = new Option<int>("--max-length") { Description = "Tokens kept per row", DefaultValueFactory = _ => 64 };
        var cell = Choice("--cell", "Recurrent cell", "gru", "gru", "lstm", "rnn");
        var embed = new Option<int>("--embed") { Description = "Embedding size", DefaultValueFactory = _ => 32 };
        var hidden = new Option<int>("--hidden") { Description = "Hidden size", DefaultValueFactory = _ => 64 };
        var layers = new Option<int>("--layers") { Description = "Stacked layers", DefaultValueFactory = _ => 1 };
        var bidirectional = new Option<bool>("--bidirectional") { Description = "Read each sequence both ways" };
        var pooling = Choice("--pooling", "How steps become one vector", "last", "last", "mean", "max", "attention");
        var epochs = new Option<int>("--epochs") { Description = "Epochs", DefaultValueFactory = _ => 8 };
        var batch = new Option<int>("--batch") { Description = "Batch size", DefaultValueFactory = _ => 64 };
        var lr = new Option<double>("--lr") { Description = "Peak learning rate", DefaultValueFactory = _ => 3e-3 };
        var optimizer = Choice("--optimizer", "Optimiser", "adam", "adam", "adamw", "sgd");
        var schedule = Choice("--schedule", "Learning-rate schedule", "constant", "constant", "warmup-cosine", "step", "plateau");
        var weightDecay = new Option<double>("--weight-decay") { Description = "L2 (adam, sgd) or decoupled (adamw) weight decay", DefaultValueFactory = _ => 0 };
        var clip = new Option<double?>("--clip") { Description = "Clip the global gradient norm to this" };
        var classWeights = Choice("--class-weights", "Class weights in the loss", "none", "none", "inverse");
        var smoothing = new Option<double>("--label-smoothing") { Description = "Label smoothing ε", DefaultValueFactory = _ => 0 };
        var monitor = Choice("--monitor", "Validation figure that picks the best epoch", "accuracy", "accuracy", "loss", "macro-f1");
        var patience = new Option<int?>("--patience") { Description = "Stop after this many epochs without improvement" };
        var seed = new Option<ulong>("--seed") { Description = "Training seed (weights, batches, dropout)", DefaultValueFactory = _ => 1 };
        var threads = new Option<int>("--threads") { Description = "Intra-op threads (0 = one per core)", DefaultValueFactory = _ => 0 };
        var outDir = new Option<string>("--out") { Description = "Output folder", DefaultValueFactory = _ => "train-out" };
        var resume = new Option<bool>("--resume") { Description = "Continue from DIR/checkpoints after an interruption" };
        var command = new Command("train", "Train one recurrent classifier and write its bundle, metrics, timings and report.")
        {
            data, text, label, group, tokenizer, maxLength, cell, embed, hidden, layers, bidirectional, pooling, epochs, batch, lr,
            optimizer, schedule, weightDecay, clip, classWeights, smoothing, monitor, patience, seed, threads, outDir, resume,
        };
        command.SetAction(parse =>
        {
            string dir = parse.GetValue(outDir)!;
            var training = new TrainingOptions
            {
                Epochs = parse.GetValue(epochs),
                BatchSize = parse.GetValue(batch),
                LearningRate = parse.GetValue(lr),
                Seed = parse.GetValue(seed),
                Threads = parse.GetValue(threads),
                Optimizer = parse.GetValue(optimizer) switch { "adamw" => OptimizerKind.AdamW, "sgd" => OptimizerKind.Sgd, _ => OptimizerKind.Adam },
                Schedule = new ScheduleOptions
                {
                    Kind = parse.GetValue(schedule) switch
                    {
                        "warmup-cosine" => ScheduleKind.WarmupCosine, "step" => ScheduleKind.Step, "plateau" => ScheduleKind.ReduceOnPlateau,
                        _ => ScheduleKind.Constant,
                    },
                },
                WeightDecay = parse.GetValue(weightDecay),
                MaxGradientNorm = parse.GetValue(clip),
                ClassWeighting = parse.GetValue(classWeights) == "inverse" ? ClassWeighting.InverseFrequency : ClassWeighting.None,
                LabelSmoothing = parse.GetValue(smoothing),
                Monitor = parse.GetValue(monitor) switch
                {
                    "loss" => MonitorMetric.ValidationLoss, "macro-f1" => MonitorMetric.ValidationMacroF1, _ => MonitorMetric.ValidationAccuracy,
                },
                Patience = parse.GetValue(patience),
                CheckpointDirectory = Path.Combine(dir, "checkpoints"),
                Resume = parse.GetValue(resume),
            };
            var spec = new RunSpec
            {
                DataPath = parse.GetValue(data)!,
                Columns = new ColumnSpec(parse.GetValue(text)!, parse.GetValue(label)!, parse.GetValue(group)),
                Tokenizer = parse.GetValue(tokenizer) switch { "byte" => TokenizerKind.Byte, "word" => TokenizerKind.Word, _ => TokenizerKind.Character },
                MaxLength = parse.GetValue(maxLength),
                Cell = parse.GetValue(cell) switch { "lstm" => CellKind.Lstm, "rnn" => CellKind.Rnn, _ => CellKind.Gru },
                EmbeddingSize = parse.GetValue(embed),
                HiddenSize = parse.GetValue(hidden),
                Layers = parse.GetValue(layers),
                Bidirectional = parse.GetValue(bidirectional),
                Pooling = Enum.Parse<PoolingKind>(parse.GetValue(pooling)!, ignoreCase: true),
                Training = training,
            };
            return CliErrors.Guard(() => Guarded(() => Run(spec, dir)));
        });
        return command;
    }

    static Option<string> Choice(string name, string description, string fallback, params string[] values)
    {
        var option = new Option<string>(name) { Description = description, DefaultValueFactory = _ => fallback };
        option.AcceptOnlyFromAmong(values);
        return option;
    }

    /// <summary>Option values the parser cannot check (checked by TrainingOptions.Validate) are bad input too: one line, exit code 2.</summary>
    internal static int Guarded(Func<int> action)
    {
        try
        {
            return action();
        }
        catch (ArgumentException e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }
    }

    static int Run(RunSpec spec, string dir)
    {
        spec.Training.Validate();
        Console.Error.WriteLine(Kit.Native.Engine.EnsureLoaded());
        string checkpoint = Trainer.CheckpointPath(spec.Training.CheckpointDirectory!);
        if (spec.Training.Resume)
            Console.Error.WriteLine(File.Exists(checkpoint) ? $"resuming from {checkpoint}" : $"--resume: no checkpoint at {checkpoint}; starting from epoch 1");
        using var cancel = new CancellationTokenSource();
        ConsoleCancelEventHandler onCancel = (_, e) =>
        {
            e.Cancel = true;
            cancel.Cancel();
            Console.Error.WriteLine("\nstopping after this batch; the best epoch so far is kept");
        };
        Console.CancelKeyPress += onCancel;
        RunOutcome run;
        try
        {
            run = SingleRun.Execute(spec, new ConsoleProgress(), cancel.Token);
        }
        finally
        {
            Console.CancelKeyPress -= onCancel;
        }
        Directory.CreateDirectory(dir);
        // Computed once: the report draws these records and metrics.json takes its calibration figures from them.
        var diagnostics = RunDiagnostics.Compute(run, spec.Diagnostics);
        double? temperature = diagnostics.Temperature.Temperature;
        var bundle = new ModelBundle
        {
            Model = run.Model,
            Tokenizer = TokenizerSpec.Of(run.Tokenizer),
            Vocabulary = run.Vocabulary,
            Labels = run.Labels,
            MaxLength = spec.MaxLength,
            Truncation = spec.Truncation,
            Temperature = temperature,
            TrainingSeed = spec.Training.Seed,
            Profile = TrainingProfileOfRun.Build(run, spec.MaxLength, temperature),
        };
        string bundlePath = Path.Combine(dir, ModelBundle.DefaultFileName);
        bundle.Save(bundlePath);
        AtomicFile.WriteAllText(Path.Combine(dir, "metrics.json"), RunMetricsJson.Metrics(run, diagnostics));
        AtomicFile.WriteAllText(Path.Combine(dir, "timings.json"), RunMetricsJson.Timings(run));
        string report = Path.Combine(dir, "report.html");
        ReportWriter.Write(report, $"{spec.Cell} classifier — {Path.GetFileName(spec.DataPath)}",
            $"Test split: accuracy {run.TestMetrics.Accuracy.ToString("P1", CultureInfo.InvariantCulture)}, macro F1 {run.TestMetrics.MacroF1.ToString("F3", CultureInfo.InvariantCulture)}.",
            RunReport.Views(run, diagnostics));
        if (run.History.StopReason is string why) Console.Error.WriteLine(why);
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"best epoch {run.History.BestEpoch}; test accuracy {run.TestMetrics.Accuracy:P2}, macro F1 {run.TestMetrics.MacroF1:F3}"));
        Console.WriteLine($"wrote {bundlePath}, metrics.json, timings.json, report.html in {dir}");
        return run.History.Stop == StopKind.Diverged ? 4 : run.History.Stop == StopKind.Cancelled ? 130 : 0;
    }
}

/// <summary>
/// metrics.json holds only numbers that the seed and data decide — no times, dates, paths beyond the file name, or
/// resume history — so two runs can be compared byte for byte. timings.json holds the rest.
/// </summary>
internal static class RunMetricsJson
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
                ["file"] = Path.GetFileName(s.DataPath),
                ["rows"] = run.Table.Count,
                ["rowsUsed"] = run.Rows.Length,
                ["classes"] = new JsonArray(names.Select(n => (JsonNode?)JsonValue.Create(n)).ToArray()),
                ["split"] = new JsonObject { ["train"] = run.Split.Train.Length, ["validation"] = run.Split.Validation.Length, ["test"] = run.Split.Test.Length, ["seed"] = s.SplitSeed },
                ["tokenizer"] = run.Tokenizer.Name,
                ["vocabulary"] = run.Vocabulary.Count,
                ["maxLength"] = s.MaxLength,
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
                    ["support"] = c.Support, ["predicted"] = c.Predicted,
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
