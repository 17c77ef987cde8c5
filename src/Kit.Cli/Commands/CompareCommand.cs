using System.CommandLine;
using System.Diagnostics;
using System.Globalization;
using Kit.Experiments;
using Kit.Training;
using Kit.Views;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit compare DATA --grid "cell=gru,lstm; embed=16,64" --seeds 3 [--folds K] --out DIR [--workers N] [--shard i/N|auto|auto/N]`:
/// a sweep of configs × seeds × folds with the n-gram naive Bayes and logistic regression baselines, each finished run appended to DIR's store;
/// re-running skips finished runs. The whole (unsharded) sweep ends with DIR/report.html.
/// </summary>
internal static class CompareCommand
{
    internal sealed record Settings(RunSpec Base, string? Grid, int Seeds, int? Folds, string Out, int Workers, string? Shard, bool Serve);

    public static Command Build()
    {
        var data = new Argument<string>("DATA") { Description = "Labelled data file (.csv, .tsv, .jsonl)" };
        var grid = new Option<string?>("--grid")
        {
            Description = "Configs: \"key=v1,v2; key=v1\" over " + string.Join(", ", RunSettings.GridKeys.Select(k => k.Key)) + " (a grid value overrides the flag)",
        };
        var seeds = new Option<int>("--seeds") { Description = "Training seeds per config", DefaultValueFactory = _ => 1 };
        var folds = new Option<int?>("--folds") { Description = "k-fold runs (default: one fixed holdout split)" };
        var output = new Option<string>("--out") { Description = "Results folder (store, sweep description, report)", Required = true };
        var workers = new Option<int>("--workers") { Description = "Worker processes sharing the cores", DefaultValueFactory = _ => 1 };
        var shard = new Option<string?>("--shard") { Description = "Run only share i of N (i/N), or take it from a job array (auto, auto/N)" };
        var serve = new Option<bool>("--serve") { Description = "Internal: act as a worker process reading run ids on standard input", Hidden = true };
        var command = new Command("compare", "Sweep configs × seeds × folds against n-gram naive Bayes and logistic regression baselines, crash-safe and resumable.") { data };
        var shared = RunOptions.AddTo(command);
        foreach (var option in new Option[] { grid, seeds, folds, output, workers, shard, serve }) command.Options.Add(option);
        command.SetAction(parse => CliErrors.Guard(() => Run(new Settings(
            shared.Read(parse, RunSettings.Defaults with { DataPath = parse.GetValue(data)! }), parse.GetValue(grid), parse.GetValue(seeds),
            parse.GetValue(folds), parse.GetValue(output)!, parse.GetValue(workers), parse.GetValue(shard), parse.GetValue(serve)),
            Environment.GetCommandLineArgs()[1..])));
        return command;
    }

    internal static int Run(Settings s, string[] args)
    {
        SweepPlan plan;
        Shard shard;
        try
        {
            if (s.Workers < 1) throw new ArgumentException($"--workers {s.Workers}: at least one worker");
            int threads = s.Base.Training.Threads > 0 ? s.Base.Training.Threads : Math.Max(1, Environment.ProcessorCount / s.Workers);
            plan = Plan(s, threads);
            shard = s.Shard is null ? Shard.Whole : Shard.Parse(s.Shard);
        }
        catch (ArgumentException e)
        {
            Console.Error.WriteLine($"compare: {e.Message}");
            return CliErrors.BadInput;
        }
        var sweep = Sweep.Prepare(plan);
        if (s.Serve) return SweepWorker.Serve(sweep, Console.In, Console.Out, Console.Error);

        var all = plan.Runs();
        Console.Error.WriteLine($"compare: {plan.AllConfigs.Count} configs (with the two baselines), {all.Count} runs in all; shard {shard}; " +
                                $"{s.Workers} worker(s) × {plan.Base.Training.Threads} thread(s); store {s.Out}");
        var workers = new List<ProcessWorker>();
        try
        {
            IReadOnlyList<IRunExecutor>? executors = null;
            if (s.Workers > 1)
            {
                for (int w = 0; w < s.Workers; w++) workers.Add(new ProcessWorker(WorkerStart(args, plan.Base.Training.Threads)));
                executors = workers;
            }
            var progress = new Progress(all.Count);
            SweepOutcome outcome;
            try
            {
                outcome = SweepRunner.Run(sweep, s.Out, shard, executors, progress);
            }
            catch (ArgumentException e)
            {
                Console.Error.WriteLine($"compare: {e.Message}");
                return CliErrors.BadInput;
            }
            foreach (var note in outcome.Notes) Console.Error.WriteLine($"note: {note}");
            Console.WriteLine($"shard {shard}: {outcome.Ran} run(s) finished now, {outcome.AlreadyDone} already in the store, {outcome.Owned} owned; store {outcome.StoreFile}");
        }
        finally
        {
            foreach (var w in workers) w.Dispose();
        }
        if (!shard.IsWhole)
        {
            Console.WriteLine($"when every shard is done: kit merge {s.Out} && kit report {s.Out}");
            return 0;
        }
        return ReportCommand.Write(s.Out);
    }

    internal static SweepPlan Plan(Settings s, int threads)
    {
        var spec = s.Base with { Training = s.Base.Training with { Threads = threads } };
        spec.Training.Validate();
        return new SweepPlan { Base = spec, Configs = SweepGrid.Parse(s.Grid), Seeds = s.Seeds, Folds = s.Folds }.Validate();
    }

    /// <summary>This same program with the same arguments, as a worker: --serve added, --threads fixed, no shard or workers.</summary>
    static ProcessStartInfo WorkerStart(string[] args, int threads)
    {
        var kept = new List<string>();
        for (int i = 0; i < args.Length; i++)
        {
            if (args[i] is "--workers" or "--threads" or "--shard") { i++; continue; }
            if (args[i].StartsWith("--workers=", StringComparison.Ordinal) || args[i].StartsWith("--threads=", StringComparison.Ordinal)
                || args[i].StartsWith("--shard=", StringComparison.Ordinal)) continue;
            kept.Add(args[i]);
        }
        kept.AddRange(["--threads", threads.ToString(CultureInfo.InvariantCulture), "--serve"]);
        string host = Environment.ProcessPath ?? throw new InvalidOperationException("cannot tell which program is running");
        var start = new ProcessStartInfo(host) { RedirectStandardError = false };
        // Under `dotnet Kit.Cli.dll` the host is dotnet and the program is the entry assembly; an apphost runs itself.
        if (Path.GetFileNameWithoutExtension(host) == "dotnet")
            start.ArgumentList.Add(typeof(CompareCommand).Assembly.Location);
        foreach (var a in kept) start.ArgumentList.Add(a);
        return start;
    }

    sealed class Progress(int total) : IProgress<SweepProgress>
    {
        readonly object _gate = new();

        public void Report(SweepProgress p)
        {
            var r = p.Record;
            lock (_gate)
                Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"[{p.AlreadyDone + p.Finished}/{total}] {r.Id}: accuracy {r.Accuracy:P2}, macro F1 {r.MacroF1:F3}, ECE {r.Ece:F3}, {r.Timing?.TotalSeconds:F1} s"));
        }
    }
}
