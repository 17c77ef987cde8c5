using System.CommandLine;
using System.Globalization;
using Kit.Experiments;
using Kit.Training;
using Kit.Views;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit train DATA …`: prepare, train with a checkpoint per epoch, then write the run's files (model bundle,
/// metrics.json, timings.json, report.html) into --out, with checkpoints/ beside them. The settings are the shared
/// run settings (<see cref="RunOptions"/>), the same flags and defaults as `kit compare`.
/// </summary>
internal static class TrainCommand
{
    public static Command Build()
    {
        var data = new Argument<string>("DATA") { Description = "Labelled rows (.csv, .tsv, .jsonl)" };
        var outDir = new Option<string>("--out") { Description = "Output folder", DefaultValueFactory = _ => "train-out" };
        var resume = new Option<bool>("--resume") { Description = "Continue from DIR/checkpoints after an interruption" };
        var baselines = new Option<bool>("--baselines") { Description = "Also fit the n-gram naive Bayes and logistic regression baselines on the same split and save them beside the model (kit score reads them)" };
        var command = new Command("train", "Train one classifier and write its bundle, metrics, timings and report.") { data };
        var shared = RunOptions.AddTo(command);
        command.Options.Add(outDir);
        command.Options.Add(resume);
        command.Options.Add(baselines);
        command.SetAction(parse => CliErrors.Guard(() =>
        {
            string dir = parse.GetValue(outDir)!;
            var spec = shared.Read(parse, RunSettings.Defaults with { DataPath = parse.GetValue(data)! });
            spec = spec with
            {
                Training = spec.Training with { CheckpointDirectory = Path.Combine(dir, "checkpoints"), Resume = parse.GetValue(resume) },
            };
            return Run(spec, dir, parse.GetValue(baselines));
        }));
        return command;
    }

    static int Run(RunSpec spec, string dir, bool baselines)
    {
        spec.Training.Validate();
        spec.Preparation.Validate();
        Console.Error.WriteLine(Kit.Native.Engine.EnsureLoaded());
        string checkpoint = Trainer.CheckpointPath(spec.Training.CheckpointDirectory!);
        if (spec.Training.Resume)
            Console.Error.WriteLine(Trainer.ResumeCheckpoint(spec.Training.CheckpointDirectory!) is string found
                ? $"resuming from {found}" : $"--resume: no checkpoint at {checkpoint}; starting from epoch 1");
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
        var f = run.Fold.Split;
        Console.Error.WriteLine($"split: {run.Data.SplitDescription}; train {f.Train.Length}, validation {f.Validation.Length}, test {f.Test.Length}");
        var files = RunWriter.Write(dir, RunReport.Of(run));
        if (run.History.StopReason is string why) Console.Error.WriteLine(why);
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"best epoch {run.History.BestEpoch}; test accuracy {run.TestMetrics.Accuracy:P2}, macro F1 {run.TestMetrics.MacroF1:F3}"));
        Console.WriteLine($"wrote {files}");
        if (baselines)
            foreach (var b in BaselineFiles.Write(run, dir))
                Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"baseline {b.Description}: test accuracy {b.TestAccuracy:P2}; wrote {b.Path}"));
        return run.History.Stop == StopKind.Diverged ? 4 : run.History.Stop == StopKind.Cancelled ? 130 : 0;
    }
}
