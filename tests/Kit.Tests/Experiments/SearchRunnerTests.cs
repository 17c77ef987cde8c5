using System.Security.Cryptography;
using System.Text;
using Kit.Experiments;
using Kit.Views;

namespace Kit.Tests.Experiments;

/// <summary>
/// The search's bookkeeping on the real store with a stand-in for training: each run's validation and test accuracy
/// come from a hash of its config, made so that validation and test rank the configs in opposite orders, and its
/// seconds are set by the test. So these tests see exactly which runs execute and what is promoted, in milliseconds.
/// </summary>
public sealed class SearchRunnerTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-search-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    static readonly Lazy<Kit.Data.LabelledTable> Table = new(() => Kit.Data.TableReader.Read(KitCli.DemoHostnames, new Kit.Data.ColumnSpec(Group: "group")));

    static Sweep Prepare(SearchSettings settings, int epochs = 9) =>
        Sweep.Prepare(SearchRunner.Plan(new RunSpec
        {
            DataPath = KitCli.DemoHostnames, Columns = new Kit.Data.ColumnSpec(Group: "group"), GroupAware = true, SampleRows = 300,
            Training = new Kit.Training.TrainingOptions { Epochs = epochs },
        }, settings), Table.Value);

    /// <summary>A drawn config's quality in [0, 1): fixed by its name, so every process agrees.</summary>
    static double Quality(string drawn) => SHA256.HashData(Encoding.UTF8.GetBytes(drawn))[0] / 256.0;

    sealed class Fake(string dir, double secondsPerEpoch = 0.5, Func<int, bool>? stopAt = null, Func<string, double>? quality = null)
    {
        int _count;
        public int Count => _count;
        public List<string> Ran { get; } = [];
        public CancellationTokenSource Cancel { get; } = new();

        public RunRecord Execute(RunKey key, SweepConfig config, Action<RunOutcome>? keep)
        {
            if (stopAt?.Invoke(_count) == true) { Cancel.Cancel(); Cancel.Token.ThrowIfCancellationRequested(); }
            Interlocked.Increment(ref _count);
            lock (Ran) Ran.Add(key.Id);
            int epochs = config.IsBaseline ? 0 : int.Parse(config.Settings["epochs"]);
            string drawn = config.IsBaseline ? config.Name : SweepConfig.Of(config.Settings.Where(kv => kv.Key != "epochs").Select(kv => (kv.Key, kv.Value)).ToArray()).Name;
            // Validation prefers high quality, test prefers low: the two rankings disagree everywhere.
            double q = config.Name == SweepConfig.LinearBaselineName ? 0.5 : config.IsBaseline ? 0.4 : (quality ?? Quality)(drawn);
            double validation = 0.3 + 0.6 * q + 0.005 * epochs, test = 0.9 - 0.6 * q + 0.005 * epochs;
            if (keep is not null)
            {
                string path = Path.Combine(dir, SearchRunner.ModelFile(key.Id));
                Directory.CreateDirectory(Path.GetDirectoryName(path)!);
                File.WriteAllText(path, "model of " + key.Id);
            }
            return new RunRecord
            {
                Id = key.Id, Config = config.Name, Settings = config.Settings, Baseline = config.IsBaseline, Model = "stand-in",
                Seed = key.Seed, Fold = key.Fold, Folds = key.Folds, Parameters = 10, Accuracy = test, MacroF1 = test, BalancedAccuracy = test,
                LogLoss = 1, Brier = 0.5, Ece = 0.1, Mce = 0.2, ClasswiseEce = 0.1, Reliability = [], ByLength = [], Epochs = [], BestEpoch = epochs,
                ClassNames = ["a", "b"], TestRows = [0, 1], TestLabels = [0, 1], Predicted = [0, 0],
                Timing = new RunTiming(secondsPerEpoch * Math.Max(1, epochs), secondsPerEpoch * Math.Max(1, epochs), 1),
                ValidationAccuracy = validation,
            };
        }
    }

    static string[] StoreLines(string dir) =>
        ResultsStore.Read(dir).Records.Select(r => r.ResultsJson()).Order(StringComparer.Ordinal).ToArray();

    static string[] Decisions(string dir) => SearchLog.Read(dir).Select(d => d.ToJsonLine()).ToArray();

    [Fact]
    public void Promotion_and_the_pick_use_validation_never_test()
    {
        var settings = new SearchSettings { Configs = 12 };
        var sweep = Prepare(settings);
        var fake = new Fake(_dir);
        var outcome = SearchRunner.Run(sweep, settings, _dir, execute: fake.Execute);

        var drawn = sweep.Plan.Configs.Select(c => c.Name).ToArray();
        var byValidation = drawn.OrderByDescending(Quality).ToArray();
        var decisions = SearchLog.Read(_dir).Where(d => d.Kind == SearchStepKind.Rung).ToArray();
        Assert.Equal([12, 4, 1], decisions.Select(d => d.Configs.Count));
        Assert.Equal([1, 3, 9], decisions.Select(d => d.Epochs));
        Assert.Equal(byValidation.Take(4), decisions[1].Configs);  // the four best by validation …
        Assert.DoesNotContain(drawn.OrderBy(Quality).First(), decisions[1].Configs); // … not the best by test
        Assert.Equal(byValidation[0], decisions[2].Configs.Single());
        // 2 baselines + 12 + 4 + 1 runs, each once.
        Assert.Equal(19, fake.Count);
        Assert.Equal(fake.Ran.Count, fake.Ran.Distinct().Count());
        // The pick: the finalist beats the linear baseline on validation (0.3 + 0.6q + 0.045 vs 0.6 when q > 0.425).
        bool finalistWins = 0.3 + 0.6 * Quality(byValidation[0]) + 0.045 > 0.6;
        Assert.Equal(finalistWins ? "chosen.kitmodel" : "chosen.kitngram", Path.GetFileName(outcome.ModelPath));
        Assert.True(File.Exists(outcome.ModelPath));
        var search = SearchRecord.Read(_dir)!;
        Assert.False(search.BudgetCut);
        Assert.Equal(4, search.Rungs[1].Entries.Count);
        Assert.Equal(1, search.Rungs[1].Entries.Count(e => e.Promoted));
        var html = SearchViews.Rungs(search).ToHtml();
        Assert.Contains("Search rungs", SearchViews.Rungs(search).Title);
        Assert.Contains("promoted", html);
        Assert.Contains("chosen", html);
    }

    [Fact]
    public void When_the_linear_baseline_is_best_on_validation_its_file_is_the_pick()
    {
        var settings = new SearchSettings { Configs = 3, Space = SearchSpace.Parse("hidden=8,16,24") };
        var sweep = Prepare(settings, epochs: 2);
        // Every drawn config validates at 0.36 + 0.005 × epochs, below the linear baseline's 0.6 (on test they win).
        var outcome = SearchRunner.Run(sweep, settings, _dir, execute: new Fake(_dir, quality: _ => 0.1).Execute);
        Assert.Equal(SweepConfig.LinearBaselineName, outcome.Choice.Configs.Single());
        Assert.Equal("chosen.kitngram", Path.GetFileName(outcome.ModelPath));
        Assert.True(NgramModelFile.IsOne(outcome.ModelPath)); // a real baseline file, refitted on the training part
        var model = NgramModelFile.Load(outcome.ModelPath);
        Assert.Equal(BaselineKind.LogisticRegression, model.Baseline.Kind);
        Assert.Equal(sweep.Labels.Names, model.Labels.Names);

        // The comparison's verdict names the best on the test rows and, apart from it, the search's validation pick.
        var contents = ResultsStore.Read(_dir);
        var comparison = ComparisonRecord.Build(SearchRecord.Finalists(contents.Records, SearchLog.Read(_dir)), contents.Notes) with { Search = SearchRecord.Read(_dir) };
        var verdict = comparison.Verdict;
        Assert.Equal(SweepConfig.LinearBaselineName, verdict.SearchChoice);
        Assert.NotEqual(verdict.BestConfig, verdict.SearchChoice);
        Assert.Contains("The search chose logistic regression by validation accuracy, and its saved model is the one to ship", verdict.Sentence());
    }

    [Fact]
    public void A_rerun_skips_finished_runs_and_leaves_the_store_as_it_was()
    {
        var settings = new SearchSettings { Configs = 12, Budget = TimeSpan.FromMinutes(10) };
        var sweep = Prepare(settings);
        var first = new Fake(_dir);
        SearchRunner.Run(sweep, settings, _dir, execute: first.Execute);
        var store = StoreLines(_dir);
        var decisions = Decisions(_dir);
        var bytes = File.ReadAllBytes(Path.Combine(_dir, ResultsStore.MainFile));

        var second = new Fake(_dir);
        var again = SearchRunner.Run(sweep, settings, _dir, execute: second.Execute);
        Assert.Equal(0, second.Count);
        Assert.Equal(0, again.Ran);
        Assert.Equal(19, again.AlreadyDone);
        Assert.Equal(bytes, File.ReadAllBytes(Path.Combine(_dir, ResultsStore.MainFile)));
        Assert.Equal(store, StoreLines(_dir));
        Assert.Equal(decisions, Decisions(_dir));
    }

    [Fact]
    public void A_cancel_mid_rung_loses_nothing_finished_and_the_rerun_ends_where_an_uninterrupted_search_ends()
    {
        var settings = new SearchSettings { Configs = 12 };
        var sweep = Prepare(settings);
        string clean = Path.Combine(_dir, "clean"), broken = Path.Combine(_dir, "broken");
        SearchRunner.Run(sweep, settings, clean, execute: new Fake(clean).Execute);

        var stopped = new Fake(broken, stopAt: n => n == 9); // in rung 0, after 2 baselines and 7 configs
        Assert.ThrowsAny<OperationCanceledException>(() => SearchRunner.Run(sweep, settings, broken, execute: stopped.Execute));
        Assert.Equal(9, ResultsStore.Read(broken).Records.Count);
        var rest = new Fake(broken);
        SearchRunner.Run(sweep, settings, broken, execute: rest.Execute);
        Assert.Equal(19 - 9, rest.Count);
        Assert.Empty(stopped.Ran.Intersect(rest.Ran));
        Assert.Equal(StoreLines(clean), StoreLines(broken));
        Assert.Equal(Decisions(clean), Decisions(broken));
    }

    [Fact]
    public async Task Two_shards_on_one_store_equal_one_unsharded_search()
    {
        var settings = new SearchSettings { Configs = 12, Poll = TimeSpan.FromMilliseconds(50) };
        var sweep = Prepare(settings);
        string whole = Path.Combine(_dir, "whole"), sharded = Path.Combine(_dir, "sharded");
        SearchRunner.Run(sweep, settings, whole, execute: new Fake(whole).Execute);

        var a = new Fake(sharded);
        var b = new Fake(sharded);
        var shards = new[] { (new Shard(1, 2), a), (new Shard(2, 2), b) }
            .Select(s => Task.Run(() => SearchRunner.Run(sweep, settings, sharded, s.Item1, execute: s.Item2.Execute))).ToArray();
        var results = await Task.WhenAll(shards).WaitAsync(TimeSpan.FromMinutes(2));
        Assert.Equal(19, a.Count + b.Count);         // every run once, split between the shards
        Assert.InRange(a.Count, 8, 11);
        Assert.Empty(a.Ran.Intersect(b.Ran));
        Assert.Equal(StoreLines(whole), StoreLines(sharded));
        Assert.Equal(Decisions(whole), Decisions(sharded));
        Assert.Equal(results[0].Choice.ToJsonLine(), results[1].Choice.ToJsonLine());
        Assert.Equal(2, Directory.GetFiles(sharded, "runs.shard-*.jsonl").Length);
    }

    [Fact]
    public void A_budget_cut_is_recorded_and_shown()
    {
        // 5 s per epoch: baselines 10 s, rung 0 = 12 × 5 s = 60 s, so 100 s leaves 30 s: too little for 4 configs × 3
        // epochs (60 s), enough for neither more than 1 epoch, so the search stops before rung 1.
        var settings = new SearchSettings { Configs = 12, Budget = TimeSpan.FromSeconds(100) };
        var sweep = Prepare(settings);
        var fake = new Fake(_dir, secondsPerEpoch: 5);
        var outcome = SearchRunner.Run(sweep, settings, _dir, execute: fake.Execute);
        Assert.NotNull(outcome.Stop);
        Assert.Equal(1, outcome.Stop!.Rung);
        Assert.Equal(30, outcome.Stop.RemainingSeconds!.Value, 9);
        Assert.Equal(14, fake.Count);
        Assert.Equal(0, outcome.Choice.Rung); // picked among rung 0 and the baselines
        var search = SearchRecord.Read(_dir)!;
        Assert.True(search.BudgetCut);
        Assert.Contains("The budget cut the search short before rung 1", SearchViews.Rungs(search).ToHtml());

        // 155 s leaves 85 s for rung 1 (4 × 3 epochs × 5 s = 60 s fits), then 25 s for rung 2, where 1 config × 9
        // epochs (45 s) shrinks to the 5 epochs that fit.
        string shrunkDir = Path.Combine(_dir, "shrunk");
        var tighter = settings with { Budget = TimeSpan.FromSeconds(155) };
        var sweep2 = Prepare(tighter);
        SearchRunner.Run(sweep2, tighter, shrunkDir, execute: new Fake(shrunkDir, secondsPerEpoch: 5).Execute);
        var last = SearchLog.Read(shrunkDir).Where(d => d.Kind == SearchStepKind.Rung).Last();
        Assert.Equal((2, 5, 9), (last.Rung, last.Epochs, last.PlannedEpochs));
        Assert.True(SearchRecord.Read(shrunkDir)!.BudgetCut);
    }
}
