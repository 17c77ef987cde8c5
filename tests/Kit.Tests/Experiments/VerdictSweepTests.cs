using Kit.Data;
using Kit.Experiments;
using Kit.Training;
using Kit.Views;

namespace Kit.Tests.Experiments;

/// <summary>
/// A real, small sweep on a sample of the demo hostnames in which one config is crippled on purpose (hidden size 2,
/// one epoch): whatever else wins, that config cannot, and the verdict must say its rival's lead over it holds.
/// </summary>
public sealed class VerdictSweepTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-verdict-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    [Fact]
    public void A_sweep_with_a_crippled_config_gets_a_verdict_that_ranks_it_last_and_says_the_lead_over_it_holds()
    {
        Kit.Native.Engine.EnsureLoaded();
        var plan = new SweepPlan
        {
            Base = new RunSpec
            {
                DataPath = KitCli.DemoHostnames, Columns = new ColumnSpec("text", "label", "group"), SampleRows = 900,
                MaxLength = 32, EmbeddingSize = 16,
                Training = new TrainingOptions { BatchSize = 32, Seed = 1, Threads = 1 },
            },
            Configs = [SweepConfig.Of(("hidden", "48"), ("epochs", "6")), SweepConfig.Of(("hidden", "2"), ("epochs", "1"))],
        };
        SweepRunner.Run(Sweep.Prepare(plan), _dir);
        var c = ComparisonRecord.Build(ResultsStore.Read(_dir).Records);
        Assert.Equal(4, c.Configs.Count);
        var crippled = c.Configs.Single(s => s.Config == "hidden=2;epochs=1");
        var good = c.Configs.Single(s => s.Config == "hidden=48;epochs=6");
        Assert.Equal(("h2 · 1 ep", "h48 · 6 ep"), (crippled.Label, good.Label));
        Assert.Same(crippled, c.Configs[^1]);

        var v = c.Verdict;
        string text = v.Sentence();
        Assert.StartsWith($"Best config: {v.BestLabel}, test accuracy ", text);
        Assert.NotEqual(crippled.Label, v.BestLabel);
        // The crippled config is neither the runner-up nor level with the best, so the verdict never names it.
        Assert.DoesNotContain(crippled.Label, text);
        // Each baseline the best is not is weighed in the verdict.
        foreach (var baseline in new[] { "naive Bayes", "logistic regression" })
            if (v.BestLabel != baseline) Assert.Contains($" {baseline} (", text);
        // The best's lead over the crippled config is established on these test rows.
        var lead = LeadOver.Of(crippled, c.PairedTests.Where(p => p.B == crippled.Config).ToArray());
        Assert.Equal((1, 1), (lead.Tested, lead.Established));
        // The good config beats the crippled one on the same rows too.
        var goodRuns = ResultsStore.Read(_dir).Records.Where(r => r.Config == good.Config).ToArray();
        var crippledRuns = ResultsStore.Read(_dir).Records.Where(r => r.Config == crippled.Config).ToArray();
        var pair = Assert.Single(PairedComparison.Compare(goodRuns, crippledRuns));
        Assert.True(pair.McNemar.PValue < 0.05 && pair.Bootstrap.Low > 0, $"good vs crippled: p = {pair.McNemar.PValue}, interval low {pair.Bootstrap.Low}");
        // The report writes the same sentence first.
        string html = File.ReadAllText(ComparisonReport.Write(_dir, c, "hostnames sample"));
        Assert.Contains(Html.Escape(text), html);
    }
}
