namespace Kit.Diagnostics;

/// <summary>
/// Occlusion attribution (Zeiler and Fergus 2014, "Visualizing and Understanding Convolutional Networks",
/// applied to token positions): replace one token at a time with the unknown token and see how much the target
/// class's probability falls. The model is reached only through <c>score</c>, which maps a batch of token-id
/// sequences to probability rows, so this file needs no engine. All variants are scored in one batch.
/// The fall is also measured in log-odds, log p − log(1 − p): near p = 1 hiding a token barely moves p (0.9999 →
/// 0.9990 is a drop of 0.0009) but moves the log-odds by a readable amount (9.2 → 6.9, a drop of 2.3), so a
/// confident call still shows which tokens carried it.
/// </summary>
public static class Occlusion
{
    public static OcclusionResult Compute(int[] tokens, Func<int[][], double[][]> score, int unknownId, int targetClass,
        IReadOnlyList<string>? tokenTexts = null)
    {
        ArgumentNullException.ThrowIfNull(score);
        InputChecks.NotEmpty(tokens, nameof(tokens));
        if (tokenTexts is not null) InputChecks.SameLength(tokens.Length, nameof(tokens), tokenTexts.Count, nameof(tokenTexts));
        if (targetClass < 0) throw new ArgumentOutOfRangeException(nameof(targetClass), $"targetClass = {targetClass} must not be negative.");
        var probabilities = Score(tokens, score, unknownId);
        int k = probabilities[0].Length;
        if (targetClass >= k) throw new ArgumentOutOfRangeException(nameof(targetClass), $"targetClass = {targetClass} but the scorer returns {k} classes.");
        double baseP = probabilities[0][targetClass], baseOdds = LogOdds(probabilities[0], targetClass);
        var positions = new OcclusionPosition[tokens.Length];
        for (int t = 0; t < tokens.Length; t++)
        {
            double p = probabilities[t + 1][targetClass], odds = LogOdds(probabilities[t + 1], targetClass);
            positions[t] = new OcclusionPosition(t, tokens[t], tokenTexts?[t], p, baseP - p, odds, baseOdds - odds);
        }
        return new OcclusionResult(tokens.ToArray(), targetClass, baseP, positions, baseOdds);
    }

    /// <summary>Both sides of the log-odds are floored at this, so p is clamped to [1e-15, 1 − 1e-15] (log-odds within ±34.5).</summary>
    public const double LogOddsFloor = ClassificationMetrics.LogLossFloor;

    /// <summary>
    /// log p − log(1 − p) of class <paramref name="target"/>, natural log. 1 − p is taken as the sum of the other
    /// classes' probabilities: computed as 1 − p it would lose every digit once p rounds towards 1 in double.
    /// </summary>
    public static double LogOdds(IReadOnlyList<double> probabilities, int target)
    {
        ArgumentNullException.ThrowIfNull(probabilities);
        if (target < 0 || target >= probabilities.Count) throw new ArgumentOutOfRangeException(nameof(target), $"target = {target} but the row has {probabilities.Count} classes.");
        double rest = 0;
        for (int k = 0; k < probabilities.Count; k++) if (k != target) rest += probabilities[k];
        return Math.Log(Math.Max(probabilities[target], LogOddsFloor)) - Math.Log(Math.Max(rest, LogOddsFloor));
    }

    /// <summary>Occlusion for the class the model predicts on the unmodified sequence.</summary>
    public static OcclusionResult ComputeForPredicted(int[] tokens, Func<int[][], double[][]> score, int unknownId, IReadOnlyList<string>? tokenTexts = null)
    {
        ArgumentNullException.ThrowIfNull(score);
        InputChecks.NotEmpty(tokens, nameof(tokens));
        var baseRow = Score([tokens], score);
        return Compute(tokens, score, unknownId, InputChecks.ArgMax(baseRow[0]), tokenTexts);
    }

    static double[][] Score(int[] tokens, Func<int[][], double[][]> score, int unknownId)
    {
        var batch = new int[tokens.Length + 1][];
        batch[0] = tokens.ToArray();
        for (int t = 0; t < tokens.Length; t++)
        {
            var variant = tokens.ToArray();
            variant[t] = unknownId;
            batch[t + 1] = variant;
        }
        return Score(batch, score);
    }

    static double[][] Score(int[][] batch, Func<int[][], double[][]> score)
    {
        var result = score(batch) ?? throw new InvalidOperationException("the scorer returned null.");
        if (result.Length != batch.Length)
            throw new InvalidOperationException($"the scorer returned {result.Length} rows for {batch.Length} sequences; it must return one per sequence.");
        if (result[0] is null || result[0].Length == 0) throw new InvalidOperationException("the scorer returned an empty probability row.");
        try { InputChecks.Probabilities(result, result[0].Length, "scorer output"); }
        catch (ArgumentException e) { throw new InvalidOperationException($"the scorer's output is not a probability table: {e.Message}", e); }
        return result;
    }
}
