using Kit.Data;
using Kit.Diagnostics;

namespace Kit.Experiments;

/// <summary>
/// Every result record the report of one run shows, computed from a <see cref="RunOutcome"/>: the data
/// (profile, split, leakage, vocabulary coverage), the test split's scores, accuracy by token length,
/// calibration (equal-width and equal-mass bins, per class, temperature fitted on validation), projections of
/// the embedding matrix and of pooled test representations, error tables and occlusion of chosen test rows.
/// The model is read once here, as plain arrays, so the views never touch the engine.
/// </summary>
public sealed record RunDiagnostics
{
    public required DatasetProfile Profile { get; init; }
    /// <summary>The run's split with token lengths per part (lengths before truncation).</summary>
    public required SplitSummary Split { get; init; }
    public required LeakageReport Leakage { get; init; }
    public required IReadOnlyList<VocabularyCoverage> Coverage { get; init; }
    /// <summary>Token length (before truncation) of each test row, in the test set's order.</summary>
    public required int[] TestLengths { get; init; }
    /// <summary>95 % intervals for test accuracy and macro F1 (null when the options ask for no bootstrap).</summary>
    public HeadlineIntervals? TestIntervals { get; init; }
    public required LengthBreakdown ByLength { get; init; }
    public required CalibrationReport Calibration { get; init; }
    public required CalibrationReport CalibrationEqualMass { get; init; }
    public required TemperatureReport Temperature { get; init; }
    /// <summary>Test-split calibration after dividing the logits by the fitted temperature (equal-width bins).</summary>
    public required CalibrationReport CalibrationAfterScaling { get; init; }
    /// <summary>PCA of the embedding matrix, one point per vocabulary entry except padding.</summary>
    public Projection? Embedding { get; init; }
    /// <summary>t-SNE of pooled test representations (null when the test split is too small or the budget is 0).</summary>
    public Projection? TestRepresentations { get; init; }
    public required ErrorAnalysis Errors { get; init; }
    public required IReadOnlyList<OcclusionCase> Occlusions { get; init; }
    public required DiagnosticsOptions Options { get; init; }
    /// <summary>Wall time spent computing these records (the t-SNE usually dominates).</summary>
    public TimeSpan Elapsed { get; init; }

    /// <summary>Fewer test rows than this and a t-SNE picture shows noise, so none is drawn.</summary>
    public const int MinProjectedRows = 20;

    public static RunDiagnostics Compute(RunOutcome run, DiagnosticsOptions? options = null, IProgress<string>? stages = null)
    {
        ArgumentNullException.ThrowIfNull(run);
        options ??= run.Spec.Diagnostics;
        options.Validate();
        var clock = System.Diagnostics.Stopwatch.StartNew();
        var names = run.Labels.Names;
        var split = run.Split;

        stages?.Report("profile, split and leakage audit");
        // Prepared once with the data: the profile, the split summary, the audit and the coverage are the data's own.
        var profile = run.Data.Profile;
        int[] lengths = run.Data.Lengths;
        var splitSummary = run.Fold.Summary;
        var leakage = run.Fold.Leakage;
        var coverage = run.Fold.Coverage;

        stages?.Report("test-split scores by length and calibration");
        int[] labels = run.Test.Labels;
        int[] predicted = run.TestMetrics.Predicted;
        int[] testLengths = run.TestLengths();
        var intervals = options.BootstrapReplicates == 0 ? null : HeadlineIntervals.Of(run.TestMetrics, options.BootstrapReplicates, options.Seed);
        var byLength = LengthBreakdown.Compute(labels, predicted, testLengths, names, LengthBins.Quantiles(options.LengthBins));
        var calibration = CalibrationReport.Compute(labels, run.TestProbabilities, names, options.ReliabilityBins, BinningScheme.EqualWidth,
            options.BootstrapReplicates, options.Seed);
        var equalMass = CalibrationReport.Compute(labels, run.TestProbabilities, names, options.ReliabilityBins, BinningScheme.EqualMass,
            options.BootstrapReplicates, options.Seed);
        var fitted = TemperatureReport.Compute(run.ValidationLogits, run.Validation.Labels, run.TestLogits, labels, names, options.ReliabilityBins);
        var after = CalibrationReport.Compute(labels, TemperatureScaling.Apply(run.TestLogits, fitted.Temperature), names,
            options.ReliabilityBins, BinningScheme.EqualWidth, bootstrap: 0);
        // The temperature's view compares reliability before and after, so the record carries both.
        var temperature = fitted with { Before = calibration, After = after };

        stages?.Report("embedding PCA");
        Projection? embedding = null;
        if (run.Config.EmbeddingSize >= 2 && run.Vocabulary.Count >= 3)
        {
            var matrix = ModelReadout.Embedding(run.Model);
            // Row 0 is padding: it never carries meaning and would sit at the origin as an outlier.
            embedding = Projection.OfTokens(matrix.Skip(1).ToArray(), run.Vocabulary.Tokens.Skip(1).ToArray(), ProjectionMethod.Pca);
        }

        Projection? representations = null;
        int take = Math.Min(options.ProjectionMaxPoints, run.Test.Count);
        if (take >= MinProjectedRows)
        {
            stages?.Report($"t-SNE of {take} pooled test representations");
            // Stratified rounding can add up to one row per class, so ask for that many fewer and cap at the budget.
            int[] sample = take < run.Test.Count
                ? PreparedData.StratifiedSample(labels, Math.Max(1, take - names.Count), options.Seed).Take(take).ToArray()
                : Enumerable.Range(0, run.Test.Count).ToArray();
            var subset = run.Test.Subset(sample);
            var pooled = ModelReadout.Pooled(run.Model, subset);
            var texts = run.TestTexts();
            var tsne = new TsneOptions
            {
                Iterations = options.TsneIterations,
                ExaggerationIterations = Math.Min(250, options.TsneIterations / 2),
                MomentumSwitchIteration = Math.Min(250, options.TsneIterations / 2),
                // Perplexity must stay well below the point count or every point's neighbourhood is everyone.
                Perplexity = Math.Min(options.TsnePerplexity, (sample.Length - 1) / 3.0),
                Seed = options.Seed,
            };
            representations = Projection.OfSequences(pooled, subset.Labels, names, ProjectionMethod.Tsne,
                sample.Select(i => predicted[i]).ToArray(), sample.Select(i => texts[i]).ToArray(), tsne);
        }

        stages?.Report("error tables and occlusion");
        var testTexts = run.TestTexts();
        var errors = ErrorAnalysis.Compute(labels, run.TestProbabilities, testTexts, names, options.ErrorRows);
        var occlusions = ExplainByOcclusion(run, testTexts, testLengths, options.OcclusionExamples);

        return new RunDiagnostics
        {
            Profile = profile, Split = splitSummary, Leakage = leakage, Coverage = coverage, TestLengths = testLengths, TestIntervals = intervals, ByLength = byLength,
            Calibration = calibration, CalibrationEqualMass = equalMass, Temperature = temperature, CalibrationAfterScaling = after,
            Embedding = embedding, TestRepresentations = representations, Errors = errors, Occlusions = occlusions, Options = options,
            Elapsed = clock.Elapsed,
        };
    }

    /// <summary>
    /// Below this largest |log-odds drop| an occlusion shows next to nothing, so the next candidate of the same kind
    /// is tried (a chosen floor, no source: hiding the token changes the odds by about 5 %).
    /// </summary>
    internal const double TrivialLogOdds = 0.05;

    /// <summary>Candidates of one kind tried before settling for the first (each costs one scoring batch).</summary>
    const int CandidatesPerKind = 5;

    /// <summary>
    /// In order: the surest mistake (what drove the wrong call), a right call nearest the decision boundary
    /// (smallest margin between the predicted class and the runner-up: what tipped it), and the surest right call
    /// among rows of at least median length (what carried it). Of each kind the first candidate whose occlusion
    /// moves the log-odds by at least <see cref="TrivialLogOdds"/> somewhere is kept, else the candidate that moves
    /// them most.
    /// </summary>
    static IReadOnlyList<OcclusionCase> ExplainByOcclusion(RunOutcome run, string[] texts, int[] lengths, int wanted)
    {
        var cases = new List<OcclusionCase>();
        if (wanted == 0) return cases;
        var probs = run.TestProbabilities;
        int[] labels = run.Test.Labels, predicted = run.TestMetrics.Predicted;
        var usable = Enumerable.Range(0, run.Test.Count).Where(i => run.Test.Length(i) > 0).ToArray();
        double median = usable.Length == 0 ? 0 : usable.Select(i => (double)lengths[i]).Order().ElementAt(usable.Length / 2);
        var kinds = new (string Why, int[] Candidates)[]
        {
            ("the test row the model got wrong with the highest confidence",
                usable.Where(i => predicted[i] != labels[i]).OrderByDescending(i => probs[i][predicted[i]]).ThenBy(i => i).Take(CandidatesPerKind).ToArray()),
            ("a test row the model got right by the narrowest margin over the runner-up class",
                usable.Where(i => predicted[i] == labels[i]).OrderBy(i => Margin(probs[i], predicted[i])).ThenBy(i => i).Take(CandidatesPerKind).ToArray()),
            ("a test row of at least median length that the model got right with the highest confidence",
                usable.Where(i => predicted[i] == labels[i] && lengths[i] >= median).OrderByDescending(i => probs[i][predicted[i]]).ThenBy(i => i)
                    .Take(CandidatesPerKind).ToArray()),
        };
        var scorer = ModelReadout.Scorer(run.Model);
        var names = run.Labels.Names;
        var taken = new HashSet<int>();
        foreach (var (why, candidates) in kinds)
        {
            if (cases.Count == wanted) break;
            (OcclusionCase Case, int Row, double Largest)? best = null;
            foreach (int row in candidates.Where(r => !taken.Contains(r)))
            {
                int[] tokens = run.Test[row].ToArray();
                var pieces = Pieces(run, texts[row], tokens);
                var result = Occlusion.Compute(tokens, scorer, Vocabulary.UnknownId, predicted[row], pieces);
                var c = new OcclusionCase(why, texts[row], names[labels[row]], names[predicted[row]], names[predicted[row]], pieces,
                    tokens.Select(t => t == Vocabulary.UnknownId).ToArray(), result);
                double largest = result.Positions.Max(p => Math.Abs(p.LogOddsDrop));
                if (best is null || largest > best.Value.Largest) best = (c, row, largest);
                if (largest >= TrivialLogOdds) break;
            }
            if (best is { } pick)
            {
                cases.Add(pick.Case);
                taken.Add(pick.Row);
            }
        }
        return cases;
    }

    /// <summary>Probability of the predicted class minus the largest other.</summary>
    static double Margin(double[] p, int top)
    {
        double second = 0;
        for (int k = 0; k < p.Length; k++) if (k != top) second = Math.Max(second, p[k]);
        return p[top] - second;
    }

    /// <summary>
    /// What each position held: the original piece when nothing was cut (so an unknown token still shows its
    /// text), otherwise the vocabulary's token for the id, since cutting makes positions and pieces disagree.
    /// </summary>
    static string[] Pieces(RunOutcome run, string text, int[] tokens)
    {
        var pieces = run.Tokenizer.Split(text);
        return pieces.Count == tokens.Length ? pieces.ToArray() : tokens.Select(run.Vocabulary.Token).ToArray();
    }
}
