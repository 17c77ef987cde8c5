using System.Diagnostics;
using Kit.Experiments;

namespace Kit.Tests.Experiments;

/// <summary>`kit compare --search` on real child processes: end to end with real training, shards, bad input.</summary>
public sealed class SearchCliTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-search-cli-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    /// <summary>A small search on the demo hostnames: 300 rows, at most 3 epochs, one engine thread.</summary>
    static List<string> TinySearch(string outDir, params string[] more)
    {
        var args = new List<string>
        {
            "compare", KitCli.DemoHostnames, "--group", "group", "--sample", "300", "--epochs", "3", "--embed", "8",
            "--max-length", "32", "--threads", "1", "--search", "4", "--grid", "encoder=gru,cnn; hidden=16..48:log; lr=3e-3..1e-2:log",
            "--out", outDir,
        };
        args.AddRange(more);
        return args;
    }

    [Fact]
    public void A_search_writes_its_rungs_the_report_and_a_model_that_kit_score_reads()
    {
        string store = Path.Combine(_dir, "search");
        var (code, stdout, stderr) = KitCli.Run(TinySearch(store, "--budget", "2m"));
        Assert.True(code == 0, $"kit compare --search failed ({code}): {stderr}");
        Assert.Contains("rungs planned 4 × 1 epoch(s), 1 × 3 epoch(s)", stderr);
        Assert.Contains("chosen model:", stdout);

        var records = ResultsStore.Read(store).Records;
        Assert.Equal(2 + 4 + 1, records.Count);
        Assert.All(records, r => Assert.NotNull(r.ValidationAccuracy));
        Assert.Equal([0, 0, 0, 0, 1], records.Where(r => !r.Baseline).Select(r => r.Rung!.Value).Order());
        var search = SearchRecord.Read(store)!;
        var choice = search.Choice!;
        var candidates = records.Where(r => r.Baseline || r.Rung == 1).ToArray();
        // The pick is the best of the finalist and both baselines on validation (ties to the linear baseline).
        Assert.Equal(candidates.Max(r => r.ValidationAccuracy!.Value), records.Single(r => r.Config == choice.Configs[0]).ValidationAccuracy);
        Assert.True(records.Single(r => r.Config == choice.Configs[0]).ValidationAccuracy >= records.Single(r => r.Config == SweepConfig.LinearBaselineName).ValidationAccuracy);

        string html = File.ReadAllText(Path.Combine(store, "report.html"));
        Assert.Contains("Search rungs", html);
        Assert.Contains("Rung 0: 4 config(s) &#215; 1 epoch(s)", html); // × as the report escapes it
        Assert.Contains("Paired tests", html);

        string model = Path.Combine(store, choice.ModelFile!);
        Assert.True(File.Exists(model));
        string scored = Path.Combine(_dir, "scored.csv");
        var (scoreCode, _, scoreErr) = KitCli.Run(["score", model, KitCli.DemoHostnames, "--out", scored]);
        Assert.True(scoreCode == 0, $"kit score on the chosen model failed ({scoreCode}): {scoreErr}");
        Assert.True(File.ReadLines(scored).Count() > 100);
    }

    [Fact]
    public async Task Two_shard_processes_on_one_store_give_the_unsharded_search()
    {
        string whole = Path.Combine(_dir, "whole"), sharded = Path.Combine(_dir, "sharded");
        using var first = Process.Start(KitCli.Start(TinySearch(sharded, "--shard", "1/2")))!;
        var firstErr = first.StandardError.ReadToEndAsync();
        var firstOut = first.StandardOutput.ReadToEndAsync();
        var (code2, out2, err2) = KitCli.Run(TinySearch(sharded, "--shard", "2/2"));
        await first.WaitForExitAsync().WaitAsync(TimeSpan.FromMinutes(4));
        Assert.True(first.ExitCode == 0, $"shard 1/2 failed: {await firstErr}");
        Assert.True(code2 == 0, $"shard 2/2 failed: {err2}");
        Assert.Contains("chosen:", await firstOut);
        Assert.Contains("chosen:", out2);

        var (code, _, err) = KitCli.Run(TinySearch(whole));
        Assert.True(code == 0, $"unsharded search failed: {err}");
        var a = ResultsStore.Read(whole).Records.ToDictionary(r => r.Id, r => r.ResultsJson());
        var b = ResultsStore.Read(sharded).Records.ToDictionary(r => r.Id, r => r.ResultsJson());
        Assert.Equal(a.Keys.Order(), b.Keys.Order());
        foreach (var (id, json) in a) Assert.Equal(json, b[id]);
        Assert.Equal(SearchLog.Read(whole).Select(d => d.ToJsonLine()), SearchLog.Read(sharded).Select(d => d.ToJsonLine()));
        var (reportCode, reportOut, reportErr) = KitCli.Run(["report", sharded]);
        Assert.True(reportCode == 0, reportErr);
        Assert.Contains("search chose", reportOut);
    }

    [Theory]
    [InlineData("--grid", "hidden=16..64", "ranges are drawn from only by a search")]
    [InlineData("--budget", "1m", "--budget caps a search")]
    public void Ranges_or_a_budget_without_search_exit_2(string flag, string value, string message)
    {
        var args = KitCli.TinySweep(Path.Combine(_dir, "bad"), "cell=gru", 1);
        int at = args.IndexOf("--grid");
        args.RemoveRange(at, 2);
        args.AddRange([flag, value]);
        var (code, _, stderr) = KitCli.Run(args);
        Assert.Equal(2, code);
        Assert.Contains(message, stderr);
    }

    [Theory]
    [InlineData("--budget", "15x", "expected a duration")]
    [InlineData("--grid", "hidden=64..16", "must be below")]
    [InlineData("--grid", "encoder=gru; epochs=1..4", "successive halving sets")]
    [InlineData("--seeds", "2", "one seed per config")]
    [InlineData("--workers", "2", "leave out --workers")]
    public void Bad_search_input_exits_2(string flag, string value, string message)
    {
        var args = TinySearch(Path.Combine(_dir, "bad"));
        if (flag == "--grid") args[args.IndexOf("--grid") + 1] = value;
        else args.AddRange([flag, value]);
        var (code, _, stderr) = KitCli.Run(args);
        Assert.Equal(2, code);
        Assert.Contains(message, stderr);
        Assert.False(File.Exists(Path.Combine(_dir, "bad", ResultsStore.MainFile)));
    }
}
