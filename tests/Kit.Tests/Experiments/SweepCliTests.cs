using System.Diagnostics;
using Kit.Experiments;

namespace Kit.Tests.Experiments;

/// <summary>The reliability promises of `kit compare`, checked on real child processes.</summary>
public sealed class SweepCliTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-sweep-cli-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    [Fact]
    public void Killed_sweep_keeps_every_finished_run_and_a_rerun_completes_the_rest_without_duplicates()
    {
        string store = Path.Combine(_dir, "killed");
        var args = KitCli.TinySweep(store, "cell=gru,rnn", seeds: 2); // 4 neural runs + 1 baseline
        string main = Path.Combine(store, ResultsStore.MainFile);
        using (var p = Process.Start(KitCli.Start(args))!)
        {
            var stderr = new System.Text.StringBuilder();
            p.ErrorDataReceived += (_, e) => { lock (stderr) stderr.AppendLine(e.Data); };
            p.BeginErrorReadLine();
            var clock = Stopwatch.StartNew();
            while (!(File.Exists(main) && File.ReadAllText(main).Contains('\n')))
            {
                Assert.False(p.HasExited, $"kit compare ended before the kill (exit {(p.HasExited ? p.ExitCode : 0)}): {stderr}");
                Assert.True(clock.Elapsed < TimeSpan.FromMinutes(4), "no run finished within 4 minutes");
                Thread.Sleep(50);
            }
            p.Kill(entireProcessTree: true); // SIGKILL: no chance to tidy up
            p.WaitForExit();
        }
        var before = ResultsStore.Read(store);
        Assert.InRange(before.Records.Count, 1, 5);
        var linesBefore = before.Records.ToDictionary(r => r.Id, r => r.ToJsonLine());

        var (code, stdout, stderr2) = KitCli.Run(args);
        Assert.True(code == 0, $"rerun failed ({code}): {stderr2}");
        Assert.Contains($"{6 - before.Records.Count} run(s) finished now, {before.Records.Count} already in the store", stdout);
        var after = ResultsStore.Read(store);
        var ids = after.Records.Select(r => r.Id).ToArray();
        Assert.Equal(6, ids.Length);
        Assert.Equal(ids.Length, ids.Distinct().Count());
        string[] expected = ["cell=gru|seed=1|fold=1/1", "cell=gru|seed=2|fold=1/1", "cell=rnn|seed=1|fold=1/1", "cell=rnn|seed=2|fold=1/1", "logistic-regression|seed=1|fold=1/1", "naive-bayes|seed=1|fold=1/1"];
        Assert.Equal(expected, ids.Order(StringComparer.Ordinal));
        foreach (var (id, line) in linesBefore)
            Assert.Equal(line, after.Records.Single(r => r.Id == id).ToJsonLine()); // kept byte for byte
        Assert.Empty(after.Notes);
        Assert.True(File.Exists(Path.Combine(store, "report.html")));
    }

    [Fact]
    public async Task Two_shards_in_parallel_then_merge_equal_one_unsharded_run_with_two_workers()
    {
        string whole = Path.Combine(_dir, "whole"), sharded = Path.Combine(_dir, "sharded");
        const string grid = "cell=gru,rnn";
        // Shards 1/2 and 2/2 at the same time, into one folder.
        using var first = Process.Start(KitCli.Start(KitCli.TinySweep(sharded, grid, 1, "--shard", "1/2")))!;
        var firstOut = first.StandardOutput.ReadToEndAsync();
        var firstErr = first.StandardError.ReadToEndAsync();
        var (code2, _, err2) = KitCli.Run(KitCli.TinySweep(sharded, grid, 1, "--shard", "2/2"));
        await first.WaitForExitAsync();
        string firstErrText = await firstErr, firstOutText = await firstOut;
        Assert.True(first.ExitCode == 0, $"shard 1/2 failed: {firstErrText}");
        Assert.True(code2 == 0, $"shard 2/2 failed: {err2}");
        Assert.Contains("kit merge", firstOutText);
        Assert.Equal(2, Directory.GetFiles(sharded, "runs.shard-*.jsonl").Length);
        var (mergeCode, mergeOut, mergeErr) = KitCli.Run(["merge", sharded]);
        Assert.True(mergeCode == 0, mergeErr);
        Assert.Contains("4 run(s)", mergeOut);

        // The same sweep unsharded, through two worker processes of one engine thread each.
        var (code, _, err) = KitCli.Run(KitCli.TinySweep(whole, grid, 1, "--workers", "2"));
        Assert.True(code == 0, err);

        var a = ResultsStore.Read(whole).Records.ToDictionary(r => r.Id);
        var b = ResultsStore.Read(sharded).Records.ToDictionary(r => r.Id);
        Assert.Equal(4, a.Count);
        Assert.Equal(a.Keys.Order(), b.Keys.Order());
        foreach (var id in a.Keys) Assert.Equal(a[id].ResultsJson(), b[id].ResultsJson());
        Assert.All(b.Values, r => Assert.NotNull(r.Shard));
        var (reportCode, reportOut, reportErr) = KitCli.Run(["report", sharded]);
        Assert.True(reportCode == 0, reportErr);
        Assert.Contains("naive-bayes", reportOut);
        // One seed per config leaves no spread: the table says so with "–", never "NaN".
        Assert.DoesNotContain("NaN", reportOut);
        Assert.Contains(" – ", reportOut);
    }

    [Fact]
    public void A_folder_holding_another_sweep_is_refused()
    {
        string store = Path.Combine(_dir, "other");
        Directory.CreateDirectory(store);
        File.WriteAllText(Path.Combine(store, ResultsStore.DefinitionFile), "{\"configs\": [\"something else\"]}");
        var (code, _, err) = KitCli.Run(KitCli.TinySweep(store, "cell=gru", 1));
        Assert.Equal(2, code);   // bad input, as for every command
        Assert.Contains("describes a different sweep", err);
        Assert.False(File.Exists(Path.Combine(store, ResultsStore.MainFile)));
    }

    [Fact]
    public void Bad_data_and_a_corrupt_store_are_reported_with_file_and_line()
    {
        string data = Path.Combine(_dir, "bad.csv");
        File.WriteAllText(data, "text,label\nalpha,x\nbeta\n");
        var (code, _, err) = KitCli.Run(["compare", data, "--out", Path.Combine(_dir, "bad-out")]);
        Assert.Equal(2, code);
        Assert.Contains("bad.csv:3", err);

        string store = Path.Combine(_dir, "corrupt");
        Directory.CreateDirectory(store);
        var good = ResultsStoreTests.Record("cell=gru", 1, 1).ToJsonLine();
        File.WriteAllText(Path.Combine(store, ResultsStore.MainFile), good + "\n" + "not json\n" + good.Replace("fold=1/2", "fold=2/2") + "\n");
        (code, _, err) = KitCli.Run(["report", store]);
        Assert.Equal(2, code);
        Assert.Contains($"{ResultsStore.MainFile}:2", err);
        Assert.Contains("not a run record", err);
    }
}
