using System.Text;
using System.Text.Json;
using Kit.Experiments;
using Kit.Training;
using Xunit.Abstractions;

namespace Kit.Tests.Experiments;

/// <summary>
/// Word → language on open data: the BIP-39 word lists (Bitcoin Improvement Proposal 39, "Mnemonic code for
/// generating deterministic keys"), as carried by the npm package bip39 version 3.1.2 (src/wordlists/*.json).
/// .ci/run fetches it (npm pack bip39@3.1.2) into .ci/work/bip39; KIT_BIP39_DIR points elsewhere.
/// </summary>
public sealed class OpenDataSweepTests(ITestOutputHelper output) : IDisposable
{
    static readonly string[] Languages = ["english", "french", "spanish", "italian", "portuguese", "czech"];
    readonly string _dir = Directory.CreateTempSubdirectory("kit-bip39-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    static string? Package()
    {
        string dir = Environment.GetEnvironmentVariable("KIT_BIP39_DIR") is { Length: > 0 } d ? d
            : Path.Combine(KitCli.RepoRoot(), ".ci", "work", "bip39", "package");
        return File.Exists(Path.Combine(dir, "src", "wordlists", "english.json")) ? dir : null;
    }

    [Fact]
    public void Character_GRU_and_ngram_baseline_sort_BIP39_words_by_language()
    {
        string? package = Package();
        if (package is null)
        {
            const string how = "BIP-39 word lists not found. Fetch them with: mkdir -p .ci/work/bip39 && cd .ci/work/bip39 && " +
                               "npm pack bip39@3.1.2 && tar xzf bip39-3.1.2.tgz (or set KIT_BIP39_DIR to the unpacked package folder).";
            Assert.False(Environment.GetEnvironmentVariable("KIT_REQUIRE_OPEN_DATA") == "1", how);
            output.WriteLine("skipped: " + how);
            return;
        }
        using (var meta = JsonDocument.Parse(File.ReadAllText(Path.Combine(package, "package.json"))))
            Assert.Equal("3.1.2", meta.RootElement.GetProperty("version").GetString()); // the figures below are for this version

        var lists = Languages.ToDictionary(l => l, l => JsonSerializer.Deserialize<string[]>(File.ReadAllText(Path.Combine(package, "src", "wordlists", l + ".json")))!);
        Assert.All(lists.Values, w => Assert.Equal(2048, w.Length)); // BIP-39: 2048 words per list
        // A word found in two lists has no single answer; leave it out (the standard's lists share 100 words,
        // all between English and French, e.g. "abandon").
        var shared = lists.SelectMany(kv => kv.Value.Distinct().Select(w => (w, kv.Key))).GroupBy(p => p.w).Where(g => g.Count() > 1).ToArray();
        Assert.Equal(100, shared.Length);
        Assert.All(shared, g => Assert.Equal(["english", "french"], g.Select(p => p.Key).Order()));
        var skip = shared.Select(g => g.Key).ToHashSet();
        var csv = new StringBuilder("text,label\n");
        foreach (var (lang, words) in lists)
            foreach (var w in words.Where(w => !skip.Contains(w))) csv.Append(w).Append(',').Append(lang).Append('\n');
        string data = Path.Combine(_dir, "bip39-words.csv");
        File.WriteAllText(data, csv.ToString());

        var plan = new SweepPlan
        {
            Base = new RunSpec
            {
                DataPath = data, MaxLength = 16, EmbeddingSize = 16, HiddenSize = 32, GroupAware = false,
                Training = new TrainingOptions { Epochs = 4, BatchSize = 64, LearningRate = 0.01, Seed = 1, Threads = 1 },
            },
            Configs = SweepGrid.Parse("cell=gru"),
            Seeds = 2,
        };
        var sweep = Sweep.Prepare(plan);
        Assert.Equal(12 * 1024 - 200, sweep.Rows.Length);
        var outcome = SweepRunner.Run(sweep, Path.Combine(_dir, "store"));
        Assert.Equal(3, outcome.Ran);
        var comparison = ComparisonRecord.Build(ResultsStore.Read(Path.Combine(_dir, "store")).Records);
        var gru = comparison.Configs.Single(c => c.Config == "cell=gru");
        var nb = comparison.Configs.Single(c => c.Baseline);
        foreach (var c in comparison.Configs) output.WriteLine($"{c.Config}: accuracy {c.Accuracy.Mean:P2} (sd {c.Accuracy.StandardDeviation:F4}), macro F1 {c.MacroF1.Mean:F3}, ECE {c.Ece.Mean:F3}");

        // Figures stated in docs/benchmarks.md (measured on this split: stratified 70/15/15, split seed 17, 1,813
        // test words; chance is 1/6). The baseline is deterministic; the GRU varies a little with seed and machine.
        Assert.Equal(1813, comparison.Configs[0].ByLength.Sum(b => b.Count) / comparison.Configs[0].Runs);
        Assert.InRange(nb.Accuracy.Mean, 0.60, 0.635);
        Assert.InRange(gru.Accuracy.Mean, 0.55, 0.70);
        Assert.True(gru.Ece.Mean < nb.Ece.Mean, "naive Bayes is known to be over-confident; the GRU should calibrate better here");
        var paired = Assert.Single(comparison.PairedTests, p => p.Seed == 1);
        Assert.Equal(1813, paired.Items);
        Assert.InRange(paired.McNemar.PValue, 0, 1);
    }
}
