using System.CommandLine;
using System.Diagnostics;
using System.Globalization;
using Kit.Data;
using Kit.Experiments;
using Kit.Training;
using Kit.Views;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit compare DATA --grid "cell=gru,lstm; embed=16,64" --seeds 3 [--folds K] --out DIR [--workers N] [--shard i/N|auto|auto/N]`:
/// a sweep of configs × seeds × folds with the naive Bayes baseline, each finished run appended to DIR's store;
/// re-running skips finished runs. The whole (unsharded) sweep ends with DIR/report.html.
/// </summary>
internal static class CompareCommand
{
    internal sealed record Settings(string Data, ColumnSpec Columns, string Tokenizer, int MaxLength, int? Sample, string? Grid,
        int Seeds, int? Folds, string Out, int Workers, int Threads, string? Shard, int Epochs, int Batch, double LearningRate,
        int Embed, int Hidden, ulong SplitSeed, ulong Seed, bool Serve);

    public static Command Build()
    {
        var data = new Argument<string>("DATA") { Description = "Labelled data file (.csv, .tsv, .jsonl)" };
        var text = new Option<string>("--text") { Description = "Column holding the text", DefaultValueFactory = _ => "text" };
        var label = new Option<string>("--label") { Description = "Column holding the class label", DefaultValueFactory = _ => "label" };
        var group = new Option<string?>("--group") { Description = "Column of group keys kept within one part of every split" };
        var tokenizer = new Option<string>("--tokenizer") { Description = "character, character-folded, byte or word", DefaultValueFactory = _ => "character" };
        var maxLength = new Option<int>("--max-length") { Description = "Longest sequence in tokens (longer ones are cut)", DefaultValueFactory = _ => 64 };
        var sample = new Option<int?>("--sample") { Description = "Use a stratified sample of this many rows" };
        var grid = new Option<string?>("--grid") { Description = "Configs: \"key=v1,v2; key=v1\" over cell, encoder, embed, hidden, layers, bidirectional, pooling, heads, positions, dropout (and embed-, layer-, head-dropout), epochs, batch, lr" };
        var seeds = new Option<int>("--seeds") { Description = "Training seeds per config", DefaultValueFactory = _ => 1 };
        var folds = new Option<int?>("--folds") { Description = "k-fold runs (default: one fixed holdout split)" };
        var output = new Option<string>("--out") { Description = "Results folder (store, sweep description, report)", Required = true };
        var workers = new Option<int>("--workers") { Description = "Worker processes sharing the cores", DefaultValueFactory = _ => 1 };
        var threads = new Option<int>("--threads") { Description = "Engine threads per worker (default: cores / workers)" };
        var shard = new Option<string?>("--shard") { Description = "Run only share i of N (i/N), or take it from a job array (auto, auto/N)" };
        var epochs = new Option<int>("--epochs") { Description = "Epochs (a grid value overrides)", DefaultValueFactory = _ => 4 };
        var batch = new Option<int>("--batch") { Description = "Batch size (a grid value overrides)", DefaultValueFactory = _ => 64 };
        var lr = new Option<double>("--lr") { Description = "Learning rate (a grid value overrides)", DefaultValueFactory = _ => 3e-3 };
        var embed = new Option<int>("--embed") { Description = "Embedding size (a grid value overrides)", DefaultValueFactory = _ => 32 };
        var hidden = new Option<int>("--hidden") { Description = "Hidden size (a grid value overrides)", DefaultValueFactory = _ => 64 };
        var splitSeed = new Option<ulong>("--split-seed") { Description = "Seed of the split (fixed across configs and training seeds)", DefaultValueFactory = _ => 17UL };
        var seed = new Option<ulong>("--seed") { Description = "First training seed", DefaultValueFactory = _ => 1UL };
        var serve = new Option<bool>("--serve") { Description = "Internal: act as a worker process reading run ids on standard input", Hidden = true };
        var command = new Command("compare", "Sweep configs × seeds × folds against an n-gram naive Bayes baseline, crash-safe and resumable.")
        {
            data, text, label, group, tokenizer, maxLength, sample, grid, seeds, folds, output, workers, threads, shard,
            epochs, batch, lr, embed, hidden, splitSeed, seed, serve,
        };
        command.SetAction(parse => CliErrors.Guard(() => Run(new Settings(parse.GetValue(data)!,
            new ColumnSpec(parse.GetValue(text)!, parse.GetValue(label)!, parse.GetValue(group)), parse.GetValue(tokenizer)!,
            parse.GetValue(maxLength), parse.GetValue(sample), parse.GetValue(grid), parse.GetValue(seeds), parse.GetValue(folds),
            parse.GetValue(output)!, parse.GetValue(workers), parse.GetValue(threads), parse.GetValue(shard), parse.GetValue(epochs),
            parse.GetValue(batch), parse.GetValue(lr), parse.GetValue(embed), parse.GetValue(hidden), parse.GetValue(splitSeed),
            parse.GetValue(seed), parse.GetValue(serve)), Environment.GetCommandLineArgs()[1..])));
        return command;
    }

    internal static int Run(Settings s, string[] args)
    {
        SweepPlan plan;
        Shard shard;
        try
        {
            if (s.Workers < 1) throw new ArgumentException($"--workers {s.Workers}: at least one worker");
            int threads = s.Threads > 0 ? s.Threads : Math.Max(1, Environment.ProcessorCount / s.Workers);
            plan = Plan(s, threads);
            shard = s.Shard is null ? Shard.Whole : Shard.Parse(s.Shard);
        }
        catch (ArgumentException e)
        {
            Console.Error.WriteLine($"compare: {e.Message}");
            return 1;
        }
        var sweep = Sweep.Prepare(plan);
        if (s.Serve) return SweepWorker.Serve(sweep, Console.In, Console.Out, Console.Error);

        var all = plan.Runs();
        Console.Error.WriteLine($"compare: {plan.AllConfigs.Count} configs (with the baseline), {all.Count} runs in all; shard {shard}; " +
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
                return 1;
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
        (TokenizerKind Kind, bool Fold) tokenizer = s.Tokenizer switch
        {
            "character" => (TokenizerKind.Character, false),
            "character-folded" => (TokenizerKind.Character, true),
            "byte" => (TokenizerKind.Byte, false),
            "word" => (TokenizerKind.Word, false),
            _ => throw new ArgumentException($"unknown tokenizer '{s.Tokenizer}' (character, character-folded, byte, word)"),
        };
        var spec = new RunSpec
        {
            DataPath = s.Data, Columns = s.Columns, Tokenizer = tokenizer.Kind, FoldCase = tokenizer.Fold, MaxLength = s.MaxLength,
            SampleRows = s.Sample, SplitSeed = s.SplitSeed, EmbeddingSize = s.Embed, HiddenSize = s.Hidden,
            GroupAware = s.Columns.Group is not null,
            Training = new TrainingOptions { Epochs = s.Epochs, BatchSize = s.Batch, LearningRate = s.LearningRate, Seed = s.Seed, Threads = threads },
        };
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
