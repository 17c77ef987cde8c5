using Kit.Experiments;
using Kit.Tests.Experiments;
using Xunit.Abstractions;

namespace Kit.Tests.Cluster;

/// <summary>
/// The job-array sweep of docs/cluster.md on a real Slurm cluster (CI starts a one-node one with .ci/slurm): the
/// page's sweep.sbatch and merge.sbatch are submitted as written, chained with --dependency=afterok: as the page
/// says, and the merged store must equal one unsharded run of the same sweep (timings and shard fields aside).
/// Only sizes change: the array, cores and time limit on the sbatch command line (which the page says override the
/// #SBATCH lines), and a small grid through the scripts' environment variables.
/// </summary>
public sealed class SlurmSweepTests : IDisposable
{
    const int Shards = 2;
    const int RunsPerShard = 6; // 2 configs × 2 seeds × 2 folds + the two n-gram baselines on 2 folds = 12 runs
    const string Grid = "cell=gru,lstm";
    const string Seeds = "2", Folds = "2";
    // Big enough that a task is still training for a few seconds after its first run (the fault test cancels then).
    const string Settings = "--sample 1500 --epochs 3 --embed 8 --hidden 32 --max-length 32";
    // Sizes for a 2-core machine; one engine thread per task, as in the reference run.
    static readonly string[] ArraySizes = [$"--array=1-{Shards}", "--cpus-per-task=1", "--time=00:10:00"];
    static readonly TimeSpan Bound = TimeSpan.FromMinutes(3);

    static readonly Lazy<IReadOnlyDictionary<string, string>> s_reference = new(UnshardedRun);
    static double s_referenceSeconds;

    readonly ITestOutputHelper _output;
    readonly string _dir;
    readonly List<string> _jobs = [];

    public SlurmSweepTests(ITestOutputHelper output)
    {
        _output = output;
        SlurmFactAttribute.Demand();
        _dir = Directory.CreateTempSubdirectory("kit-slurm-").FullName;
        foreach (var script in new[] { "sweep.sbatch", "merge.sbatch" })
            File.WriteAllText(Path.Combine(_dir, script), ClusterPage.Block($"`{script}`"));
        Directory.CreateDirectory(Logs);
    }

    public void Dispose()
    {
        foreach (var job in _jobs) // nothing of ours stays queued or running after a failed test
            try { SlurmCluster.Run("scancel", [job]); } catch (Exception) { /* best effort */ }
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { /* a cancelled job may still be closing files */ }
    }

    string Logs => Path.Combine(_dir, "logs");
    string Out => Path.Combine(_dir, "sweep");
    string ShardFile(int index) => Path.Combine(Out, new Shard(index, Shards).FileName);

    [SlurmFact]
    public void The_documented_array_and_merge_jobs_give_the_unsharded_result_and_a_report()
    {
        var (array, merge) = SubmitAsDocumented();
        var tasks = WaitUntilEnded(array);
        Assert.True(tasks.Count == Shards && tasks.All(t => t.State == "COMPLETED"),
            $"array tasks: {SlurmCluster.Describe(tasks)}\n{Diagnostics()}");
        var merged = WaitUntilEnded(merge);
        Assert.True(merged.Single().State == "COMPLETED", $"merge job: {SlurmCluster.Describe(merged)}\n{Diagnostics()}");

        for (int i = 1; i <= Shards; i++)
            Assert.Contains($"shard {i}/{Shards}: {RunsPerShard} run(s) finished now, 0 already in the store, {RunsPerShard} owned",
                TaskLog(array, i));
        AssertMergedEqualsReference();
    }

    [SlurmFact]
    public void A_task_cancelled_mid_sweep_and_resubmitted_loses_nothing_and_redoes_nothing()
    {
        string first = Submit("sweep.sbatch");
        var clock = System.Diagnostics.Stopwatch.StartNew();
        while (!(File.Exists(ShardFile(1)) && File.ReadAllText(ShardFile(1)).Contains('\n')))
        {
            var jobs = SlurmCluster.Jobs(first);
            Assert.False(jobs.Any(j => j.Id == $"{first}_1" && j.State is not ("PENDING" or "RUNNING" or "CONFIGURING")),
                $"task 1 ended before its first run reached {ShardFile(1)}: {SlurmCluster.Describe(jobs)}\n{Diagnostics()}");
            Assert.True(clock.Elapsed < Bound, $"no run of task 1 finished within {Bound.TotalSeconds:0} s\n{Diagnostics()}");
            Thread.Sleep(50);
        }
        SlurmCluster.Cancel($"{first}_1");
        var tasks = WaitUntilEnded(first).ToDictionary(t => t.Id, t => t.State);
        Assert.True(tasks.GetValueOrDefault($"{first}_1") == "CANCELLED" && tasks.GetValueOrDefault($"{first}_2") == "COMPLETED",
            $"after cancelling task 1: {string.Join(", ", tasks)}\n{Diagnostics()}");

        var kept = ResultsStore.Read(Out);
        var keptLines = kept.Records.ToDictionary(r => r.Id, r => r.ToJsonLine());
        int done = kept.Records.Count(r => r.Shard == $"1/{Shards}");
        Assert.True(done is >= 1 and < RunsPerShard,
            $"task 1 had {done} of {RunsPerShard} runs when cancelled; the test needs it cancelled mid-way\n{Diagnostics()}");
        Assert.Equal(RunsPerShard, kept.Records.Count(r => r.Shard == $"2/{Shards}"));
        _output.WriteLine($"task 1 cancelled after {done} of {RunsPerShard} runs");

        // The same array again, then the merge job after it, as the page says to do when tasks fail.
        var (again, merge) = SubmitAsDocumented();
        var rerun = WaitUntilEnded(again);
        Assert.True(rerun.Count == Shards && rerun.All(t => t.State == "COMPLETED"), $"resubmitted array: {SlurmCluster.Describe(rerun)}\n{Diagnostics()}");
        var merged = WaitUntilEnded(merge);
        Assert.True(merged.Single().State == "COMPLETED", $"merge job: {SlurmCluster.Describe(merged)}\n{Diagnostics()}");

        // Finished runs were skipped, not redone: the resubmitted tasks say so, and their lines are kept byte for byte.
        Assert.Contains($"shard 1/{Shards}: {RunsPerShard - done} run(s) finished now, {done} already in the store, {RunsPerShard} owned",
            TaskLog(again, 1));
        Assert.Contains($"shard 2/{Shards}: 0 run(s) finished now, {RunsPerShard} already in the store, {RunsPerShard} owned",
            TaskLog(again, 2));
        var after = ResultsStore.Read(Out).Records.ToDictionary(r => r.Id);
        foreach (var (id, line) in keptLines) Assert.Equal(line, after[id].ToJsonLine());
        AssertMergedEqualsReference();
    }

    /// <summary>The page's submit commands with this machine's sizes added; returns the array and merge job ids.</summary>
    (string Array, string Merge) SubmitAsDocumented()
    {
        string submit = ClusterPage.Block("Submit both");
        Assert.Contains("array=$(sbatch --parsable sweep.sbatch)", submit);
        Assert.Contains("sbatch --dependency=afterok:\"$array\" merge.sbatch", submit);
        string array = Submit("sweep.sbatch");
        string merge = SlurmCluster.Submit(_dir, Environment(), $"--dependency=afterok:{array}", "merge.sbatch");
        _jobs.Add(merge);
        return (array, merge);
    }

    string Submit(string script)
    {
        string id = SlurmCluster.Submit(_dir, Environment(), [.. ArraySizes, script]);
        _jobs.Add(id);
        return id;
    }

    /// <summary>The scripts' settings; sbatch hands its environment on to the jobs.</summary>
    Dictionary<string, string> Environment()
    {
        string kit = $"{KitCli.Host()} {KitCli.CliDll}";
        Assert.False(KitCli.CliDll.Contains(' ') || KitCli.Host().Contains(' '),
            $"the job script splits $KIT on spaces; these paths must have none: {kit}");
        return new()
        {
            ["KIT"] = kit, ["KIT_DATA"] = KitCli.DemoHostnames, ["KIT_OUT"] = Out, ["KIT_GRID"] = Grid,
            ["KIT_SEEDS"] = Seeds, ["KIT_FOLDS"] = Folds, ["KIT_SETTINGS"] = Settings,
        };
    }

    IReadOnlyList<(string Id, string State, string Reason)> WaitUntilEnded(string job)
    {
        var clock = System.Diagnostics.Stopwatch.StartNew();
        var jobs = SlurmCluster.WaitUntilEnded(job, Bound, Diagnostics);
        _output.WriteLine($"{job}: {SlurmCluster.Describe(jobs)} (waited {clock.Elapsed.TotalSeconds:0.0} s)");
        return jobs;
    }

    string TaskLog(string array, int task)
    {
        string file = Path.Combine(Logs, $"kit-sweep-{array}_{task}.out");
        Assert.True(File.Exists(file), $"no job output {file}\n{Diagnostics()}");
        return File.ReadAllText(file);
    }

    string Diagnostics() => SlurmCluster.Report(Logs, _jobs);

    void AssertMergedEqualsReference()
    {
        Assert.Empty(Directory.GetFiles(Out, "runs.shard-*.jsonl")); // merged and removed
        var store = ResultsStore.Read(Out);
        Assert.Empty(store.Notes);
        var ids = store.Records.Select(r => r.Id).ToList();
        Assert.Equal(ids.Count, ids.Distinct().Count()); // nothing duplicated
        var reference = s_reference.Value;
        _output.WriteLine($"unsharded reference run: {s_referenceSeconds:0.0} s");
        Assert.Equal(reference.Keys.Order(StringComparer.Ordinal), ids.Order(StringComparer.Ordinal)); // nothing lost
        foreach (var r in store.Records) Assert.Equal(reference[r.Id], r.ResultsJson());
        Assert.All(store.Records, r => Assert.NotNull(r.Shard));
        string report = Path.Combine(Out, "report.html");
        Assert.True(File.Exists(report) && new FileInfo(report).Length > 0, $"no report at {report}\n{Diagnostics()}");
        Assert.Contains("naive-bayes", File.ReadAllText(report));
    }

    /// <summary>The same sweep unsharded on this machine: two worker processes of one engine thread each (as every array task has).</summary>
    static IReadOnlyDictionary<string, string> UnshardedRun()
    {
        string dir = Directory.CreateTempSubdirectory("kit-slurm-reference-").FullName;
        try
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            var (code, _, err) = KitCli.Run([
                "compare", KitCli.DemoHostnames, "--text", "text", "--label", "label", "--group", "group",
                "--grid", Grid, "--seeds", Seeds, "--folds", Folds, .. Settings.Split(' '), "--workers", "2", "--threads", "1", "--out", dir,
            ]);
            Assert.True(code == 0, $"unsharded reference run failed ({code}): {err}");
            s_referenceSeconds = clock.Elapsed.TotalSeconds;
            var records = ResultsStore.Read(dir).Records;
            Assert.Equal(Shards * RunsPerShard, records.Count);
            return records.ToDictionary(r => r.Id, r => r.ResultsJson());
        }
        finally { Directory.Delete(dir, recursive: true); }
    }
}
