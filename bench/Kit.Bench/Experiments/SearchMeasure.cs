using System.Diagnostics;
using System.Globalization;
using Kit.Data;
using Kit.Experiments;
using Kit.Tests.Experiments;

namespace Kit.Bench.Experiments;

/// <summary>
/// `search-<set>`: what one `kit compare --search 12 --budget 10m` reaches on each WordNet 3.0 set (Miller 1995;
/// Fellbaum 1998; Debian wordnet-base, /usr/share/wordnet or KIT_WORDNET_DIR) against the linear n-gram baseline
/// of the same run, and its wall time. Compare's defaults otherwise (8 epochs, one holdout split), every core.
/// The sets are read by the tests' own loader (WordNetSets, linked in), so bench and tests train on the same rows.
/// lemmas: single-word lemmas with one part of speech, character tokens; glosses: non-instance synset glosses with
/// one part of speech, word tokens. KIT_BENCH_SEARCH_BUDGET (e.g. 30s) and KIT_BENCH_SEARCH_SAMPLE (rows) shrink
/// the run for a smoke test; the figures then say so.
/// </summary>
public sealed class SearchMeasure : IMeasure
{
    static readonly string[] Sets = ["lemmas", "glosses"];

    public IReadOnlyList<string> Ids { get; } =
        Sets.SelectMany(s => new[] { $"search-{s}-accuracy", $"search-{s}-vs-linear", $"search-{s}-wall-s" }).ToArray();

    public IEnumerable<Figure> Run()
    {
        if (WordNetSets.Folder() is not { } dir)
        {
            Console.Error.WriteLine($"search-*: WordNet 3.0 not found ({WordNetSets.Install}); no figures");
            yield break;
        }
        string budgetText = Environment.GetEnvironmentVariable("KIT_BENCH_SEARCH_BUDGET") is { Length: > 0 } b ? b : "10m";
        int? sample = int.TryParse(Environment.GetEnvironmentVariable("KIT_BENCH_SEARCH_SAMPLE"), out int n) ? n : null;
        var budget = SuccessiveHalving.ParseBudget(budgetText);
        string work = Path.Combine(Path.GetTempPath(), "kit-bench-search-" + Environment.ProcessId);
        Directory.CreateDirectory(work);
        try
        {
            foreach (var set in Sets)
            {
                bool lemmas = set == "lemmas";
                string csv = Path.Combine(work, $"wordnet-{set}.csv");
                WordNetSets.WriteCsv(lemmas ? WordNetSets.Lemmas(dir) : WordNetSets.Glosses(dir), csv, dir);
                var spec = RunSettings.Defaults with
                {
                    DataPath = csv, Tokenizer = lemmas ? TokenizerKind.Character : TokenizerKind.Word, SampleRows = sample,
                };
                var settings = new SearchSettings { Configs = 12, Budget = budget };
                var clock = Stopwatch.StartNew();
                var sweep = Sweep.Prepare(SearchRunner.Plan(spec, settings));
                var outcome = SearchRunner.Run(sweep, settings, Path.Combine(work, set));
                double wall = clock.Elapsed.TotalSeconds;
                var records = ResultsStore.Read(Path.Combine(work, set)).Records;
                var chosen = records.Single(r => r.Config == outcome.Choice.Configs[0]);
                var linear = records.Single(r => r.Config == SweepConfig.LinearBaselineName);
                string how = string.Create(CultureInfo.InvariantCulture,
                    $"WordNet {set}{(sample is int s ? $" (sample of {s} rows)" : "")}, --search 12 --budget {budgetText}: picked {chosen.Config} " +
                    $"(validation {chosen.ValidationAccuracy:P2}); linear baseline test {linear.Accuracy:P2}; " +
                    $"{(outcome.Stop is null ? "all rungs ran" : "budget cut before rung " + outcome.Stop.Rung)}; {records.Count} runs");
                yield return new Figure($"search-{set}-accuracy", 100 * chosen.Accuracy, "%", "≥ linear baseline", how);
                yield return new Figure($"search-{set}-vs-linear", 100 * (chosen.Accuracy - linear.Accuracy), "points", "≥ 0 (within noise)", how);
                yield return new Figure($"search-{set}-wall-s", wall, "s", $"≤ budget ({budget.TotalSeconds:F0} s) plus the first rung's overrun", how);
            }
        }
        finally
        {
            Directory.Delete(work, recursive: true);
        }
    }
}
