using Kit.Experiments;
using Kit.Views;

namespace Kit.Tests.Experiments;

public class ComparisonVerdictTests
{
    /// <summary>A run of <paramref name="config"/> on <paramref name="n"/> two-class items, wrong exactly on <paramref name="wrong"/>.</summary>
    internal static RunRecord Run(string config, IEnumerable<int> wrong, int n = 1000, ulong seed = 1, long parameters = 1000,
        double seconds = 10, bool baseline = false)
    {
        var miss = wrong.ToHashSet();
        var labels = Enumerable.Range(0, n).Select(i => i % 2).ToArray();
        var predicted = labels.Select((y, i) => miss.Contains(i) ? 1 - y : y).ToArray();
        var settings = baseline ? new Dictionary<string, string>()
            : config.Split(';').Select(p => p.Split('=')).ToDictionary(p => p[0], p => p[1]);
        int hits = n - miss.Count;
        return ResultsStoreTests.Record(config, seed, 1, hits / (double)n, folds: 1) with
        {
            Settings = settings, Baseline = baseline, Parameters = parameters, Timing = new RunTiming(seconds, seconds, 1),
            Epochs = baseline ? [] : [new EpochPoint(1, 0.7, 0.6, 0.8, hits / (double)n)],
            TestRows = Enumerable.Range(0, n).ToArray(), TestLabels = labels, Predicted = predicted,
            ByLength = [new LengthPoint("[1, 9]", 1, 9, n, hits)],
        };
    }

    static IEnumerable<int> Range(int from, int count) => Enumerable.Range(from, count);

    /// <summary>
    /// Four configs whose paired outcomes are set by hand: the best (gru, h128) is wrong on items 0–99; lstm on
    /// 0–159 (60 more, none fewer: a clear loss); the small gru on 0–89 and 100–114 (15 against 10 discordant
    /// items: level); naive Bayes on 0–199.
    /// </summary>
    static ComparisonRecord Hand() => ComparisonRecord.Build(
    [
        Run("cell=gru;hidden=128", Range(0, 100), parameters: 50_000),
        Run("cell=lstm;hidden=128", Range(0, 160), parameters: 60_000),
        Run("cell=gru;hidden=32", Range(0, 90).Concat(Range(100, 15)), parameters: 8_000),
        Run(SweepConfig.BaselineName, Range(0, 200), parameters: 200_000, baseline: true),
    ]);

    [Fact]
    public void A_clear_winner_with_a_cheaper_level_config_reads_as_such()
    {
        var v = Hand().Verdict;
        Assert.Equal("gru · h128", v.BestLabel);
        // Wilson (1927) score interval for 900 of 1,000, z = 1.959964, in the closed form Newcombe (1998) gives as
        // method 3; written out here rather than taken from Kit's own Wilson.
        double z = 1.959963984540054, n = 1000, p = 0.9, d = 1 + z * z / n, centre = (p + z * z / (2 * n)) / d,
            half = z * Math.Sqrt(p * (1 - p) / n + z * z / (4 * n * n)) / d;
        Assert.Equal(centre - half, v.Low, 12);
        Assert.Equal(centre + half, v.High, 12);
        Assert.Equal("gru · h32", v.RunnerUp!.Label);
        Assert.True(v.RunnerUp.Level);
        var nb = Assert.Single(v.Baselines);
        Assert.Equal((1, 1), (nb.Tested, nb.Established));
        Assert.Equal("gru · h32", v.CheapestLevelLabel);
        string text = v.Sentence();
        Assert.StartsWith("Best config: gru · h128, test accuracy 90.0 % (95 % Wilson interval on 1,000 test rows: 88.0 % to 91.7 %).", text);
        Assert.Contains("Its lead over the runner-up gru · h32 (+0.5 points, 95 % interval ", text);
        Assert.Contains("McNemar p = 0.4237) is not established", text);   // (|15 − 10| − 1)² / 25 = 0.64; P(χ²₁ ≥ 0.64) = erfc(√0.32) = 0.42371, from Python 3.11 math.erfc
        Assert.Contains("its lead over naive Bayes (+10.0 points, 95 % interval ", text);
        Assert.Contains("McNemar p < 0.0001) is established", text);
        Assert.Contains("The cheapest config level with it is gru · h32 (8,000 parameters against 50,000)", text);
        Assert.DoesNotContain("lstm", text); // neither runner-up nor baseline nor cheap: not named
        Assert.Equal(1 + 1, v.ToDataFrame().Rows.Count);
    }

    [Fact]
    public void A_tie_is_not_established_and_the_cheaper_twin_is_level()
    {
        // Same accuracy, five items each way: McNemar's exact p is 1.
        var v = ComparisonRecord.Build(
        [
            Run("cell=gru", Range(0, 100), parameters: 9_000),
            Run("cell=lstm", Range(5, 100), parameters: 3_000),
        ]).Verdict;
        Assert.Equal("gru", v.BestLabel);   // equal means: the comparison orders by name
        Assert.Equal((1, 0), (v.RunnerUp!.Tested, v.RunnerUp.Established));
        Assert.Contains("over the runner-up lstm (+0.0 points, 95 % interval ", v.Sentence());
        Assert.Contains("McNemar p = 1) is not established", v.Sentence());
        Assert.Contains("The cheapest config level with it is lstm (3,000 parameters against 9,000)", v.Sentence());
    }

    [Fact]
    public void With_several_seeds_the_verdict_counts_them_and_a_costlier_level_config_is_not_named()
    {
        var v = ComparisonRecord.Build(
        [
            Run("cell=gru", Range(0, 100), seed: 1, parameters: 1_000), Run("cell=gru", Range(0, 110), seed: 2, parameters: 1_000),
            // Seed 1: rnn is wrong on 60 more items (established); seed 2: on 2 more.
            Run("cell=rnn", Range(0, 160), seed: 1, parameters: 5_000), Run("cell=rnn", Range(0, 112), seed: 2, parameters: 5_000),
        ]).Verdict;
        Assert.Equal((2, 1), (v.Seeds, v.Folds));
        // Seed 2: only 2 discordant items (gru right, rnn wrong on 110, 111): exact p = 0.5, not established.
        Assert.Equal((2, 1), (v.RunnerUp!.Tested, v.RunnerUp.Established));
        string text = v.Sentence();
        Assert.Contains("mean over 2 seeds", text);
        Assert.Contains("(95 % t interval over runs:", text);
        Assert.Contains("Its lead over the runner-up rnn (+3.1 points on average) is established in 1 of 2 seeds", text);
        Assert.Contains("No cheaper config is level with it.", text); // rnn is not level and costs more anyway
    }

    [Fact]
    public void The_report_and_the_notebook_view_open_with_the_verdict()
    {
        var c = Hand();
        var views = ComparisonReport.Views(c);
        Assert.Equal("Verdict", views[0].Title);
        Assert.Contains(Html.Escape(c.Verdict.Sentence()), views[0].ToHtml());
        Assert.True(ViewRegistry.TryGetView(c, out var shown));
        var stack = Assert.IsType<StackView>(shown);
        Assert.Equal("Verdict", stack.Parts[0].Title);
        Assert.StartsWith("<div class=\"kit-stack\"><p class=\"kit-verdict\">", stack.ToHtml());
        Assert.True(ViewRegistry.TryGetView(c.Verdict, out var alone));
        Assert.Contains("Best config", alone!.ToHtml());
    }

    [Fact]
    public void The_paired_table_names_its_one_test_method_once_in_the_caption()
    {
        string html = ComparisonViews.Paired(Hand()).ToHtml();
        // Every pair here has at least 25 discordant items, so every row used the corrected χ².
        Assert.Equal(1, CountOf(html, Html.Escape("χ² (continuity-corrected)")));
        Assert.Contains("<caption>", html);
        Assert.DoesNotContain("McNemar method", html);
        // A mix (the tie above has 10 discordant items: exact) gets a column instead.
        var mixed = ComparisonRecord.Build([Run("cell=gru", Range(0, 100)), Run("cell=lstm", Range(5, 100)), Run("cell=rnn", Range(0, 200))]);
        string mixedHtml = ComparisonViews.Paired(mixed).ToHtml();
        Assert.Contains("McNemar method", mixedHtml);
        Assert.Contains("exact binomial", mixedHtml);
    }

    static int CountOf(string text, string part)
    {
        int count = 0;
        for (int i = text.IndexOf(part, StringComparison.Ordinal); i >= 0; i = text.IndexOf(part, i + part.Length, StringComparison.Ordinal)) count++;
        return count;
    }

    /// <summary>Five configs and both baselines at 84.4–86.4 % with spread over three seeds: the narrow range.</summary>
    internal static ComparisonRecord NarrowComparison()
    {
        var runs = new List<RunRecord>();
        string[] configs = ["cell=gru;embed=32;hidden=128;bidirectional=true", "cell=gru;embed=32;hidden=128;bidirectional=false",
            "cell=lstm;embed=32;hidden=128;bidirectional=true", "cell=lstm;embed=32;hidden=128;bidirectional=false", "cell=rnn;embed=32;hidden=128;bidirectional=true"];
        for (int c = 0; c < configs.Length; c++)
            for (ulong seed = 1; seed <= 3; seed++)
                runs.Add(Run(configs[c], Range(0, 136 + 5 * c + (int)seed * 2), seed: seed, parameters: 20_000 + 10_000 * c));
        runs.Add(Run(SweepConfig.BaselineName, Range(0, 156), parameters: 90_000, baseline: true));
        runs.Add(Run(SweepConfig.LinearBaselineName, Range(0, 150), parameters: 90_000, baseline: true));
        return ComparisonRecord.Build(runs);
    }
}
