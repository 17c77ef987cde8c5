using Kit.Data;
using Kit.Experiments;
using Xunit.Abstractions;

namespace Kit.Tests.Experiments;

/// <summary>
/// The two n-gram baselines, run through the sweep (table reader, stratified 70/15/15 holdout with split seed 17,
/// the kit's tokenizer), checked two ways: against accuracy bands on open data (Princeton WordNet 3.0, see
/// <see cref="WordNetSets"/>), and against the general-purpose library scikit-learn on the same split
/// (<see cref="ReferenceLibrary"/>): the kit's logistic regression within 1 point of its LogisticRegression and the
/// kit's naive Bayes within 0.5 point of its MultinomialNB. Missing data or library: skipped with an install hint,
/// or a failure under KIT_REQUIRE_OPEN_DATA=1 / KIT_REQUIRE_SKLEARN=1 (.ci/run sets both).
/// </summary>
public sealed class OpenDataBaselineTests(ITestOutputHelper output) : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-baselines-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    sealed record KitFigures(Sweep Sweep, RunRecord NaiveBayes, RunRecord LogisticRegression);

    static KitFigures RunBaselines(string csv, TokenizerKind tokenizer, string? group)
    {
        var plan = new SweepPlan
        {
            Base = new RunSpec { DataPath = csv, Columns = new ColumnSpec("text", "label", group), Tokenizer = tokenizer, GroupAware = group is not null },
            Configs = SweepGrid.Parse(""),
        }.Validate();
        var sweep = Sweep.Prepare(plan);
        ulong seed = plan.Base.Training.Seed;
        return new KitFigures(sweep,
            sweep.Execute(new RunKey(SweepConfig.BaselineName, seed, 1, 1)),
            sweep.Execute(new RunKey(SweepConfig.LinearBaselineName, seed, 1, 1)));
    }

    /// <summary>The reference library on the sweep's own split, fed the kit's tokens.</summary>
    ReferenceLibrary.Figures Reference(KitFigures kit, string name)
    {
        var sweep = kit.Sweep;
        var tokenizer = sweep.Plan.Base.CreateTokenizer();
        var unit = sweep.Plan.BaselineNgrams.Unit;
        (string, int) Row(int p)
        {
            int r = sweep.Rows[p];
            var tokens = tokenizer.Split(sweep.Table.Texts[r]);
            return (unit == NgramUnit.Word ? string.Join(' ', tokens) : string.Concat(tokens), sweep.Labels[sweep.Table.Labels[r]]);
        }
        var split = sweep.Splits[0];
        return ReferenceLibrary.Score(Path.Combine(_dir, name), unit, split.Train.Select(Row), split.Test.Select(Row), sweep.Plan.NaiveBayesSmoothing);
    }

    /// <summary>Null when the library can be used; otherwise skips (returns the reason) or fails when it is required.</summary>
    string? LibraryMissing()
    {
        var (version, problem) = ReferenceLibrary.Probe();
        if (version is not null) return null;
        string how = $"scikit-learn not usable: {problem}. Install: {ReferenceLibrary.Install}. Set {ReferenceLibrary.Variable}=1 to make this a failure.";
        Assert.False(ReferenceLibrary.Required, how);
        output.WriteLine("skipped: " + how);
        return how;
    }

    void Compare(KitFigures kit, ReferenceLibrary.Figures reference, string name)
    {
        output.WriteLine($"{name}: kit logistic regression {kit.LogisticRegression.Accuracy:P2} ({kit.LogisticRegression.Timing?.TrainSeconds:F1} s), " +
                         $"naive Bayes {kit.NaiveBayes.Accuracy:P2}; scikit-learn {reference.Version}: LogisticRegression {reference.LogisticRegression:P2} " +
                         $"({reference.LogisticRegressionSeconds:F1} s), MultinomialNB {reference.NaiveBayes:P2}; {reference.Features} features; " +
                         $"{kit.LogisticRegression.TestLabels.Length} test rows");
        output.WriteLine($"  {kit.LogisticRegression.Model}");
        Assert.True(Math.Abs(kit.LogisticRegression.Accuracy - reference.LogisticRegression) <= 0.01,
            $"{name}: kit logistic regression {kit.LogisticRegression.Accuracy:P2} vs scikit-learn {reference.Version} {reference.LogisticRegression:P2}");
        Assert.True(Math.Abs(kit.NaiveBayes.Accuracy - reference.NaiveBayes) <= 0.005,
            $"{name}: kit naive Bayes {kit.NaiveBayes.Accuracy:P2} vs scikit-learn {reference.Version} {reference.NaiveBayes:P2}");
    }

    [Theory]
    [InlineData("hostnames.csv", TokenizerKind.Character)]
    [InlineData("maintenance-notes.csv", TokenizerKind.Word)]
    public void Demo_set_baselines_match_the_reference_library_on_the_same_split(string file, TokenizerKind tokenizer)
    {
        if (LibraryMissing() is not null) return;
        var kit = RunBaselines(Path.Combine(KitCli.RepoRoot(), "data-demo", file), tokenizer, "group");
        Compare(kit, Reference(kit, file), file);
    }

    [Theory]
    [InlineData("lemmas")]
    [InlineData("glosses")]
    public void WordNet_part_of_speech_baselines_reach_their_bands_and_match_the_reference_library(string set)
    {
        if (WordNetGate.FolderOrSkip(output) is not { } folder) return;
        Assert.Contains("WordNet 3.0 Copyright 2006 by Princeton University", WordNetSets.Licence(folder));
        bool lemmas = set == "lemmas";
        var rows = lemmas ? WordNetSets.Lemmas(folder) : WordNetSets.Glosses(folder);
        string csv = WordNetSets.WriteCsv(rows, Path.Combine(_dir, $"wordnet-{set}.csv"), folder);
        var kit = RunBaselines(csv, lemmas ? TokenizerKind.Character : TokenizerKind.Word, group: null);
        output.WriteLine($"wordnet {set}: {rows.Count} rows, {string.Join(", ", rows.GroupBy(r => r.Label).Select(g => $"{g.Key} {g.Count()}"))}");

        // Sizes of WordNet 3.0 as Debian's wordnet-base carries it (counted by this loader): 75,860 single-word
        // lemmas with one part of speech; 109,929 non-instance synsets, giving 109,382 distinct gloss texts with one
        // part of speech.
        if (lemmas) Assert.Equal(75_860, rows.Count);
        else Assert.InRange(rows.Count, 109_000, 109_929);
        // Bands around the figures measured on this split (docs/benchmarks.md); always answering "noun" scores 67 %
        // on both sets, so the bands sit well above it. Both baselines are deterministic given the split.
        // Measured (Debian wordnet-base 3.0, 2026-12-02): lemmas 89.78 % and 86.56 %, glosses 91.41 % and 86.44 %.
        var (lr, nb) = lemmas ? ((0.88, 0.915), (0.85, 0.88)) : ((0.90, 0.93), (0.85, 0.88));
        output.WriteLine($"kit: logistic regression {kit.LogisticRegression.Accuracy:P2}, naive Bayes {kit.NaiveBayes.Accuracy:P2}");
        Assert.InRange(kit.LogisticRegression.Accuracy, lr.Item1, lr.Item2);
        Assert.InRange(kit.NaiveBayes.Accuracy, nb.Item1, nb.Item2);

        if (LibraryMissing() is not null) return;
        Compare(kit, Reference(kit, "wordnet-" + set), "wordnet " + set);
    }
}
