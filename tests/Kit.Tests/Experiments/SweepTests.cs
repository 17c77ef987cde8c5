using Kit.Data;
using Kit.Experiments;
using Kit.Training;
using Kit.Views;

namespace Kit.Tests.Experiments;

public sealed class SweepTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-sweep-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    static SweepPlan TinyPlan(string grid, int seeds, int? folds) => new()
    {
        Base = new RunSpec
        {
            DataPath = KitCli.DemoHostnames, Columns = new ColumnSpec("text", "label", "group"), SampleRows = 300,
            MaxLength = 32, EmbeddingSize = 8, HiddenSize = 16,
            Training = new TrainingOptions { Epochs = 1, BatchSize = 32, Seed = 1, Threads = 1 },
        },
        Configs = SweepGrid.Parse(grid), Seeds = seeds, Folds = folds,
    };

    /// <summary>Runs the baseline for real and answers neural runs with the baseline's figures under their own id, so the share logic is checked without training.</summary>
    sealed class Recording(Sweep sweep) : IRunExecutor
    {
        public List<string> Asked { get; } = new();

        public RunRecord Execute(RunKey key, CancellationToken cancel)
        {
            Asked.Add(key.Id);
            var baseline = sweep.Execute(new RunKey(SweepConfig.BaselineName, sweep.Plan.Base.Training.Seed, key.Fold, key.Folds));
            return baseline with { Id = key.Id, Config = key.Config, Seed = key.Seed };
        }
    }

    [Fact]
    public void Shard_auto_under_a_Slurm_array_runs_exactly_its_share()
    {
        var sweep = Sweep.Prepare(TinyPlan("cell=gru,rnn", seeds: 2, folds: 2));
        var all = sweep.Plan.Runs();
        Assert.Equal(12, all.Count); // 2 configs × 2 seeds × 2 folds, and 2 baselines × 2 folds
        // Task 8 of --array=7-9 is shard 2 of 3 (variables as the sbatch manual lists them).
        var env = new Dictionary<string, string> { ["SLURM_ARRAY_TASK_ID"] = "8", ["SLURM_ARRAY_TASK_MIN"] = "7", ["SLURM_ARRAY_TASK_MAX"] = "9" };
        var shard = Shard.Parse("auto", k => env.GetValueOrDefault(k));
        var recorder = new Recording(sweep);
        var outcome = SweepRunner.Run(sweep, _dir, shard, [recorder]);
        Assert.Equal([all[1].Id, all[4].Id, all[7].Id, all[10].Id], recorder.Asked);
        Assert.Equal(Path.Combine(_dir, "runs.shard-2-of-3.jsonl"), outcome.StoreFile);
        Assert.All(ResultsStore.Read(_dir).Records, r => Assert.Equal("2/3", r.Shard));
        // Running the same shard again finds its share done.
        var again = new Recording(sweep);
        Assert.Equal(0, SweepRunner.Run(sweep, _dir, shard, [again]).Ran);
        Assert.Empty(again.Asked);
        // A Kubernetes Indexed Job pod with JOB_COMPLETION_INDEX=0 and --shard auto/3 takes positions 0, 3, 6, 9.
        var k8s = new Recording(sweep);
        SweepRunner.Run(sweep, _dir, Shard.Parse("auto/3", k => k == "JOB_COMPLETION_INDEX" ? "0" : null), [k8s]);
        Assert.Equal([all[0].Id, all[3].Id, all[6].Id, all[9].Id], k8s.Asked);
    }

    [Fact]
    public void Kfold_sweep_scores_every_item_once_per_config_and_seed_and_reports_the_comparison()
    {
        Kit.Native.Engine.EnsureLoaded();
        var sweep = Sweep.Prepare(TinyPlan("cell=gru", seeds: 1, folds: 2));
        var outcome = SweepRunner.Run(sweep, _dir);
        Assert.Equal(6, outcome.Ran); // gru, naive Bayes and logistic regression, two folds each
        var records = ResultsStore.Read(_dir).Records;
        foreach (var config in records.GroupBy(r => r.Config))
        {
            var items = config.SelectMany(r => r.TestRows).Order().ToArray();
            Assert.Equal(sweep.Rows.Order(), items); // the folds' test parts tile the sample
        }
        var gru = records.Where(r => !r.Baseline).ToArray();
        Assert.All(gru, r => Assert.Single(r.Epochs));
        Assert.All(gru, r => Assert.StartsWith("GRU hidden 16, layers 1, embedding 8, pooling last, no dropout, 1 epochs", r.Model));
        Assert.All(records, r => Assert.Equal(r.TestRows.Length, r.ByLength.Sum(b => b.Count)));
        Assert.All(records, r => Assert.Equal(r.TestRows.Length, r.Reliability.Sum(b => b.Count)));
        Assert.All(records, r => Assert.Equal(r.Accuracy, r.Correct().Count(c => c) / (double)r.TestRows.Length, 12));

        // The baseline executed again gives the same record, timings aside. (Neural runs are checked across
        // processes in SweepCliTests: in here, other test classes may train at the same time and share the
        // engine's global generator.)
        foreach (var baseline in records.Where(r => r.Baseline && r.Fold == 1))
            Assert.Equal(baseline.ResultsJson(), sweep.Execute(baseline.Key).ResultsJson());

        var comparison = ComparisonRecord.Build(records);
        Assert.Equal(3, comparison.Configs.Count);
        Assert.Equal(2, comparison.PairedTests.Count); // the best against each of the other two
        foreach (var paired in comparison.PairedTests)
        {
            Assert.Equal(sweep.Rows.Length, paired.Items);
            Assert.Equal(2, paired.Folds);
            var best = records.Where(r => r.Config == paired.A).OrderBy(r => r.Fold).SelectMany(r => r.Correct()).ToArray();
            var other = records.Where(r => r.Config == paired.B).OrderBy(r => r.Fold).SelectMany(r => r.Correct()).ToArray();
            Assert.Equal(McNemar.Test(best, other), paired.McNemar);
        }
        Assert.Equal(comparison.Configs.Count, comparison.ToDataFrame().Rows.Count);

        string html = ReportWriter.Render("t", "s", ComparisonReport.Views(comparison));
        Assert.Contains("data-kit-charts=\"5\"", html);
        Assert.Contains("naive-bayes", html);
        Assert.Contains("logistic-regression", html);
    }
}
