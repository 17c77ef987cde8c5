using Kit.Data;
using Kit.Training;

namespace Kit.Diagnostics;

/// <summary>Per-row counts the drift check reads, for texts scored by a bundle: tokens before truncation and unknown tokens kept.</summary>
public sealed record TokenCounts(int[] Raw, int[] Unknown);

/// <summary>The drift check from a notebook: score texts with a bundle and compare them with its training profile.</summary>
public static class BundleDrift
{
    /// <summary>Null when the bundle carries no training profile (bundles written before profiles existed).</summary>
    public static DriftReport? Check(ModelBundle bundle, IReadOnlyList<string> texts)
    {
        if (bundle.Profile is null) return null;
        var scores = TextScorer.Score(bundle, texts);
        return Compare(bundle.Profile, scores.Probabilities, scores.Predicted, scores.Tokens, Count(scores));
    }

    /// <summary>Raw token counts and unknown tokens among those kept, as the bundle's scorer counted them.</summary>
    public static TokenCounts Count(TextScores scores) => new(scores.RawTokens, scores.UnknownTokens);

    /// <summary>The comparison itself, from scores of either path (engine or ONNX Runtime); flagged rows (null probabilities) count for lengths and tokens only.</summary>
    public static DriftReport Compare(TrainingProfile profile, IReadOnlyList<double[]?> probabilities, IReadOnlyList<int> predicted,
        IReadOnlyList<int> keptTokens, TokenCounts counts)
    {
        var usable = Enumerable.Range(0, probabilities.Count).Where(i => probabilities[i] is not null).ToArray();
        return DriftReport.Compute(profile, counts.Raw, keptTokens.Sum(x => (long)x), counts.Unknown.Sum(x => (long)x),
            usable.Select(i => probabilities[i]!.Max()).ToArray(), usable.Select(i => predicted[i]).ToArray());
    }
}
