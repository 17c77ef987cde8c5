using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using Kit.Common;
using Kit.Data;

namespace Kit.Experiments;

/// <summary>A budgeted search: how many configs to draw from which space, η, and the wall-clock budget (none: no cap).</summary>
public sealed record SearchSettings
{
    public required int Configs { get; init; }
    public SearchSpace Space { get; init; } = SearchSpace.Default;
    public TimeSpan? Budget { get; init; }
    public int Eta { get; init; } = SuccessiveHalving.DefaultEta;
    /// <summary>How often a shard looks at the store while it waits for the other shards to finish a rung.</summary>
    public TimeSpan Poll { get; init; } = TimeSpan.FromSeconds(2);

    /// <summary>What a results folder records about the search (a folder holding another search is refused).</summary>
    public string Describe() => string.Create(CultureInfo.InvariantCulture,
        $"{Configs} configs from \"{Space.Describe()}\", successive halving with η = {Eta}, budget {(Budget is { } b ? $"{b.TotalSeconds:R} s" : "none")}");
}

/// <summary>What one call of <see cref="SearchRunner.Run"/> did and what the search chose.</summary>
public sealed record SearchOutcome(int Ran, int AlreadyDone, SearchDecision? Stop, SearchDecision Choice, string ModelPath, IReadOnlyList<string> Notes);

/// <summary>
/// Runs a search (see <see cref="SuccessiveHalving"/>) over a results folder: the two baselines and every drawn config
/// for the first rung's epochs, then rung by rung the best by validation accuracy for more epochs, until the last
/// rung or the budget. Every run is a record in the crash-safe store the moment it ends, and every decision (a
/// rung's members and epochs, a budget cut, the final pick) a line of <see cref="SearchLog"/>, so a rerun skips
/// finished runs and makes the same decisions. The budget is counted in measured run seconds (the stored records'
/// timings, divided by the number of shards running at once), so the decisions follow from the stored records and
/// not from when a process happened to start. Shards split each rung's runs and wait (polling the store) until the
/// rung is complete before promoting. The pick is the best of the last rung and both baselines by validation
/// accuracy, so a search never ends with a model that does worse than the linear baseline on the validation part.
/// </summary>
public static class SearchRunner
{
    public const string ModelsFolder = "models";

    /// <summary>The sweep plan of a search: <paramref name="baseSpec"/> with the configs drawn with its training seed.</summary>
    public static SweepPlan Plan(RunSpec baseSpec, SearchSettings settings) => new SweepPlan
    {
        Base = baseSpec,
        Configs = settings.Space.Sample(settings.Configs, baseSpec.Training.Seed),
        Search = settings.Describe(),
    }.Validate();

    /// <summary>A drawn config trained for a rung's epochs (the store's config name carries the epochs).</summary>
    public static SweepConfig RungConfig(SweepConfig drawn, int epochs) =>
        SweepConfig.Of([.. drawn.Settings.Select(kv => (kv.Key, kv.Value)), ("epochs", epochs.ToString(CultureInfo.InvariantCulture))]);

    /// <summary>The drawn config a rung run belongs to (its settings without the epochs).</summary>
    public static string DrawnName(RunRecord r) =>
        r.Baseline ? r.Config : SweepConfig.Of(r.Settings.Where(kv => kv.Key != "epochs").Select(kv => (kv.Key, kv.Value)).ToArray()).Name;

    /// <summary>Where a rung run's model bundle is kept, relative to the results folder.</summary>
    public static string ModelFile(string runId) =>
        Path.Combine(ModelsFolder, "run-" + Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(runId)))[..16] + ".kitmodel");

    /// <param name="execute">Runs one rung run (tests count executions through it); the default trains in this process.</param>
    public static SearchOutcome Run(Sweep sweep, SearchSettings settings, string dir, Shard? shard = null, IProgress<string>? log = null,
        CancellationToken cancel = default, Func<RunKey, SweepConfig, Action<RunOutcome>?, RunRecord>? execute = null)
    {
        shard ??= Shard.Whole;
        var plan = sweep.Plan;
        if (plan.Search is null) throw new ArgumentException("this sweep was not planned as a search (SearchRunner.Plan)");
        if (plan.Folds is not null) throw new ArgumentException("--search runs on one holdout split; leave out --folds");
        if (plan.Seeds != 1) throw new ArgumentException("--search trains one seed per config; leave out --seeds");
        SweepRunner.CheckDefinition(sweep, dir);
        execute ??= (key, config, keep) => sweep.Execute(key, config, null, cancel, keep);
        var inv = CultureInfo.InvariantCulture;
        var drawn = plan.Configs.ToDictionary(c => c.Name, StringComparer.Ordinal);
        var order = plan.Configs.Select(c => c.Name).ToArray();
        var schedule = SuccessiveHalving.Schedule(order.Length, plan.Base.Training.Epochs, settings.Eta);
        ulong seed = plan.Base.Training.Seed;
        int lanes = shard.Count;
        var notes = ResultsStore.Read(dir).Notes.ToList();
        using var runs = new ResultsWriter(Path.Combine(dir, shard.FileName));
        using var decisions = new ResultsWriter(Path.Combine(dir, SearchLog.FileName(shard)));
        if (runs.RepairedBytes > 0) notes.Add($"{runs.Path}: removed a torn final line of {runs.RepairedBytes} bytes before appending");
        int ran = 0, already = 0;

        SearchDecision Decide(SearchDecision fresh)
        {
            var stored = SearchLog.Read(dir).FirstOrDefault(d => d.Slot == fresh.Slot);
            if (stored is not null) return stored;
            decisions.AppendLine(fresh.ToJsonLine());
            log?.Report($"decision: {Describe(fresh)}");
            return fresh;
        }

        SearchDecision? last = null, stop = null;
        for (int k = 0; k < schedule.Count; k++)
        {
            SearchDecision fresh;
            var target = schedule[k];
            if (k == 0)
                fresh = new SearchDecision
                {
                    Kind = SearchStepKind.Rung, Rung = 0, Epochs = target.Epochs, PlannedEpochs = target.Epochs, Configs = order,
                    RemainingSeconds = settings.Budget?.TotalSeconds, Note = $"all {order.Length} drawn configs and both baselines",
                };
            else
            {
                var store = ResultsStore.Read(dir).Records.ToDictionary(r => r.Id, StringComparer.Ordinal);
                var previous = last!.Configs.Select(c => store[Key(RungConfig(drawn[c], last.Epochs)).Id]).ToArray();
                var promoted = SuccessiveHalving.Promote(previous.Select(r => (DrawnName(r), r.ValidationAccuracy ?? double.NaN)).ToArray(), target.Configs);
                fresh = new SearchDecision
                {
                    Kind = SearchStepKind.Rung, Rung = k, Epochs = target.Epochs, PlannedEpochs = target.Epochs, Configs = promoted,
                    Note = $"best {promoted.Count} of {previous.Length} by validation accuracy",
                };
                if (settings.Budget is { } budget)
                {
                    double used = store.Values.Sum(r => r.Timing?.TotalSeconds ?? 0) / lanes;
                    double perEpoch = previous.Where(r => promoted.Contains(DrawnName(r))).Sum(r => (r.Timing?.TotalSeconds ?? 0) / last.Epochs);
                    var call = SuccessiveHalving.Fit(target.Epochs, last.Epochs, perEpoch, lanes, budget.TotalSeconds - used);
                    fresh = fresh with
                    {
                        Kind = call.Stop ? SearchStepKind.Stop : SearchStepKind.Rung, Epochs = call.Epochs,
                        EstimatedSeconds = call.EstimatedSeconds, RemainingSeconds = budget.TotalSeconds - used,
                        Note = fresh.Note + "; " + call.Note,
                    };
                }
            }
            var decision = Decide(fresh);
            if (decision.Kind == SearchStepKind.Stop) { stop = decision; break; }

            var rungRuns = decision.Configs.Select(c => (Key: Key(RungConfig(drawn[c], decision.Epochs)), Config: RungConfig(drawn[c], decision.Epochs), Rung: (int?)k)).ToList();
            if (k == 0) rungRuns.InsertRange(0, SweepConfig.Baselines.Select(b => (Key(b), b, (int?)null)));
            var finished = ResultsStore.Read(dir).FinishedIds;
            for (int p = 0; p < rungRuns.Count; p++)
            {
                if (!shard.Owns(p)) continue;
                var (key, config, rung) = rungRuns[p];
                if (finished.Contains(key.Id)) { already++; continue; }
                cancel.ThrowIfCancellationRequested();
                Action<RunOutcome>? keep = config.IsBaseline ? null : outcome =>
                {
                    string path = Path.Combine(dir, ModelFile(key.Id));
                    Directory.CreateDirectory(Path.GetDirectoryName(path)!);
                    RunBundle.Of(outcome, temperature: null).Save(path); // before the record: a stored run always has its model
                };
                var record = execute(key, config, keep) with { Rung = rung, Shard = shard.IsWhole ? null : shard.ToString() };
                if (record.Id != key.Id) throw new InvalidOperationException($"asked for run {key.Id} but got {record.Id}");
                runs.Append(record);
                ran++;
                log?.Report(string.Create(inv, $"rung {k}, {config.Name}: validation {record.ValidationAccuracy:P2}, test {record.Accuracy:P2}, {record.Timing?.TotalSeconds:F1} s"));
            }
            WaitForRung(dir, rungRuns.Select(r => r.Key.Id).ToArray(), k, shard, settings.Poll, log, cancel);
            last = decision;
        }
        var (choice, modelPath) = Choose(sweep, dir, last!, Decide);
        return new SearchOutcome(ran, already, stop, choice, modelPath, notes);

        RunKey Key(SweepConfig c) => new(c.Name, seed, 1, 1);
    }

    /// <summary>Blocks until the store holds every run of the rung (other shards' runs arrive in their own files).</summary>
    static void WaitForRung(string dir, string[] ids, int rung, Shard shard, TimeSpan poll, IProgress<string>? log, CancellationToken cancel)
    {
        var told = DateTime.MinValue;
        while (true)
        {
            var done = ResultsStore.Read(dir).FinishedIds;
            int missing = ids.Count(id => !done.Contains(id));
            if (missing == 0) return;
            if (shard.IsWhole) throw new InvalidOperationException($"rung {rung}: {missing} run(s) are missing from the store after running them");
            if (DateTime.UtcNow - told > TimeSpan.FromSeconds(30))
            {
                log?.Report($"shard {shard}: waiting for {missing} run(s) of rung {rung} from the other shards");
                told = DateTime.UtcNow;
            }
            if (cancel.WaitHandle.WaitOne(poll)) cancel.ThrowIfCancellationRequested();
        }
    }

    /// <summary>
    /// The best of the last rung's configs and both baselines by validation accuracy; a tie goes to the linear
    /// baseline, then naive Bayes, then the config drawn first (the simpler model wins when the data cannot tell).
    /// Its model goes to chosen.kitmodel (a neural config's bundle, kept when it ran) or chosen.kitngram (a baseline
    /// refitted on the same training part, deterministic), where `kit score` reads it.
    /// </summary>
    static (SearchDecision Choice, string Path) Choose(Sweep sweep, string dir, SearchDecision last, Func<SearchDecision, SearchDecision> decide)
    {
        var store = ResultsStore.Read(dir).Records.ToDictionary(r => r.Id, StringComparer.Ordinal);
        var drawn = sweep.Plan.Configs.ToDictionary(c => c.Name, StringComparer.Ordinal);
        ulong seed = sweep.Plan.Base.Training.Seed;
        var candidates = new List<(RunRecord Record, int Rank)>
        {
            (store[new RunKey(SweepConfig.LinearBaselineName, seed, 1, 1).Id], 0),
            (store[new RunKey(SweepConfig.BaselineName, seed, 1, 1).Id], 1),
        };
        candidates.AddRange(last.Configs.Select((c, i) => (store[new RunKey(RungConfig(drawn[c], last.Epochs).Name, seed, 1, 1).Id], 2 + i)));
        var best = candidates.OrderByDescending(c => c.Record.ValidationAccuracy ?? double.NegativeInfinity).ThenBy(c => c.Rank).First().Record;
        string file = best.Baseline ? "chosen.kitngram" : "chosen.kitmodel";
        var choice = decide(new SearchDecision
        {
            Kind = SearchStepKind.Choice, Rung = last.Rung, Epochs = best.Baseline ? 0 : last.Epochs, Configs = [best.Config], ModelFile = file,
            Note = string.Create(CultureInfo.InvariantCulture,
                $"best validation accuracy {best.ValidationAccuracy:P2} among the {last.Configs.Count} config(s) of rung {last.Rung} and both baselines"),
        });
        string path = Path.Combine(dir, choice.ModelFile ?? file);
        if (!File.Exists(path))
        {
            var chosen = store.Values.First(r => r.Config == choice.Configs[0]);
            if (chosen.Baseline) WriteBaseline(sweep, chosen.Config == SweepConfig.LinearBaselineName ? BaselineKind.LogisticRegression : BaselineKind.NaiveBayes, path);
            else
            {
                string kept = Path.Combine(dir, ModelFile(chosen.Id));
                if (!File.Exists(kept)) throw new InvalidOperationException($"the chosen run {chosen.Id} has no kept model at {kept}; was it run in another folder?");
                AtomicFile.WriteAllBytes(path, File.ReadAllBytes(kept));
            }
        }
        return (choice, path);
    }

    static void WriteBaseline(Sweep sweep, BaselineKind kind, string path)
    {
        var split = sweep.Splits[0];
        var data = sweep.Data;
        var baseline = NgramBaseline.Fit(kind, split.Train.Select(p => data.Pieces[p]).ToArray(), split.Train.Select(p => data.LabelIds[p]).ToArray(),
            data.Labels.Count, sweep.Plan.BaselineNgrams, sweep.Plan.NaiveBayesSmoothing, sweep.Plan.LinearL2);
        new NgramModelFile { Baseline = baseline, Tokenizer = TokenizerSpec.Of(data.Tokenizer), Labels = data.Labels }.Save(path);
    }

    /// <summary>A decision in one line, for progress output.</summary>
    public static string Describe(SearchDecision d) => d.Kind switch
    {
        SearchStepKind.Rung => $"rung {d.Rung}: {d.Configs.Count} config(s) × {d.Epochs} epoch(s){(d.Epochs != d.PlannedEpochs ? $" (planned {d.PlannedEpochs})" : "")} — {d.Note}",
        SearchStepKind.Stop => $"stop before rung {d.Rung} — {d.Note}",
        _ => $"chose {d.Configs[0]} — {d.Note}; model {d.ModelFile}",
    };
}
