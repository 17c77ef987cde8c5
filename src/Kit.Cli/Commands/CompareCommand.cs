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
    internal sealed record Settings(RunSpec Base, string? Grid, int Seeds, int? Folds, string Out, int Workers, string? Shard, bool Serve,
        int? Search = null, string? Budget = null);

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
        var search = new Option<int?>("--search")
        {
            Description = "Draw N configs from the grid (lists and ranges such as hidden=32..256:log; default space without --grid) " +
                          "and run them by successive halving up to --epochs, promoting by validation accuracy",
        };
        var budget = new Option<string?>("--budget") { Description = "Wall-clock cap of a search (90s, 15m, 1h): rungs shrink or stop to fit" };
        var serve = new Option<bool>("--serve") { Description = "Internal: act as a worker process reading run ids on standard input", Hidden = true };
        var command = new Command("compare", "Sweep configs × seeds × folds against n-gram naive Bayes and logistic regression baselines, crash-safe and resumable.") { data };
        var shared = RunOptions.AddTo(command);
        foreach (var option in new Option[] { grid, seeds, folds, output, workers, shard, search, budget, serve }) command.Options.Add(option);
        command.SetAction(parse => CliErrors.Guard(() => Run(new Settings(
            shared.Read(parse, RunSettings.Defaults with { DataPath = parse.GetValue(data)! }), parse.GetValue(grid), parse.GetValue(seeds),
            parse.GetValue(folds), parse.GetValue(output)!, parse.GetValue(workers), parse.GetValue(shard), parse.GetValue(serve),
            parse.GetValue(search), parse.GetValue(budget)),
            Environment.GetCommandLineArgs()[1..])));
        return command;
    }

    internal static int Run(Settings s, string[] args)
    {
        SweepPlan plan;
        Shard shard;
        SearchSettings? search = null;
        try
        {
            if (s.Workers < 1) throw new ArgumentException($"--workers {s.Workers}: at least one worker");
            if (s.Budget is not null && s.Search is null) throw new ArgumentException("--budget caps a search; add --search N");
            int threads = s.Base.Training.Threads > 0 ? s.Base.Training.Threads : Math.Max(1, Environment.ProcessorCount / s.Workers);
            if (s.Search is int n)
            {
                if (s.Workers > 1) throw new ArgumentException("--search runs in this process (use --shard i/N for parallel searches); leave out --workers");
                if (s.Folds is not null) throw new ArgumentException("--search runs on one holdout split; leave out --folds");
                if (s.Seeds != 1) throw new ArgumentException("--search trains one seed per config; leave out --seeds");
                search = new SearchSettings
                {
                    Configs = n, Space = s.Grid is null ? SearchSpace.Default : SearchSpace.Parse(s.Grid),
                    Budget = s.Budget is null ? null : SuccessiveHalving.ParseBudget(s.Budget),
                };
                var spec = s.Base with { Training = s.Base.Training with { Threads = threads } };
                spec.Training.Validate();
                plan = SearchRunner.Plan(spec, search);
            }
            else plan = Plan(s, threads);
            shard = s.Shard is null ? Shard.Whole : Shard.Parse(s.Shard);
        }
        catch (ArgumentException e)
        {
            Console.Error.WriteLine($"compare: {e.Message}");
            return CliErrors.BadInput;
        }
        var sweep = Sweep.Prepare(plan);
        if (search is not null) return RunSearch(sweep, search, s.Out, shard);
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

    static int RunSearch(Sweep sweep, SearchSettings search, string dir, Shard shard)
    {
        var schedule = SuccessiveHalving.Schedule(search.Configs, sweep.Plan.Base.Training.Epochs, search.Eta);
        Console.Error.WriteLine($"compare: search of {search.Describe()}; rungs planned " +
                                string.Join(", ", schedule.Select(r => $"{r.Configs} × {r.Epochs} epoch(s)")) + $"; shard {shard}; store {dir}");
        SearchOutcome outcome;
        try
        {
            outcome = SearchRunner.Run(sweep, search, dir, shard, new SyncProgress(line => Console.Error.WriteLine(line)));
        }
        catch (ArgumentException e)
        {
            Console.Error.WriteLine($"compare: {e.Message}");
            return CliErrors.BadInput;
        }
        foreach (var note in outcome.Notes) Console.Error.WriteLine($"note: {note}");
        Console.WriteLine($"shard {shard}: {outcome.Ran} run(s) finished now, {outcome.AlreadyDone} already in the store");
        if (outcome.Stop is not null) Console.WriteLine($"the budget cut the search short: {outcome.Stop.Note}");
        Console.WriteLine($"chosen: {outcome.Choice.Configs[0]} ({outcome.Choice.Note})");
        Console.WriteLine($"chosen model: {outcome.ModelPath} (score new rows: kit score {outcome.ModelPath} DATA --out FILE.csv)");
        if (!shard.IsWhole)
        {
            Console.WriteLine($"kit report {dir} writes the report (every shard has finished the search when this one has)");
            return 0;
        }
        return ReportCommand.Write(dir);
    }

    /// <summary>Writes each line at once, on the reporting thread (Progress&lt;T&gt; would post them later).</summary>
    sealed class SyncProgress(Action<string> write) : IProgress<string>
    {
        public void Report(string value) => write(value);
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
