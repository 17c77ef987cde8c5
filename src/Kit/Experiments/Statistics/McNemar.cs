namespace Kit.Experiments;

public enum McNemarMethod { ExactBinomial, ChiSquaredCorrected, ChiSquared }

/// <summary>
/// McNemar's test of two classifiers scored on the same items (McNemar 1947). Only the discordant items count:
/// <see cref="OnlyA"/> right where B was wrong, <see cref="OnlyB"/> the reverse. Under the null each discordant
/// item is a fair coin, so the exact test is a two-sided binomial test; for larger counts the chi-squared
/// statistic (|b − c| − 1)² / (b + c) with Edwards' (1948) continuity correction is used.
/// </summary>
public sealed record McNemarResult(int BothRight, int OnlyA, int OnlyB, int BothWrong, McNemarMethod Method, double Statistic, double PValue)
{
    public int Discordant => OnlyA + OnlyB;
    public int Count => BothRight + OnlyA + OnlyB + BothWrong;
    /// <summary>Accuracy of A minus accuracy of B on these items.</summary>
    public double AccuracyDifference => Count == 0 ? double.NaN : (OnlyA - OnlyB) / (double)Count;
}

public static class McNemar
{
    /// <summary>
    /// Below this many discordant items the exact binomial test is used. 25 is common practice, no source
    /// beyond textbooks' rules of thumb; the exact test is valid at any count, the approximation only for large.
    /// </summary>
    public const int ExactBelow = 25;

    /// <summary>From per-item correctness of A and B (same items, same order).</summary>
    public static McNemarResult Test(IReadOnlyList<bool> correctA, IReadOnlyList<bool> correctB)
    {
        if (correctA.Count != correctB.Count)
            throw new ArgumentException($"{correctA.Count} items for A but {correctB.Count} for B; McNemar needs the same items.");
        int both = 0, onlyA = 0, onlyB = 0, neither = 0;
        for (int i = 0; i < correctA.Count; i++)
        {
            if (correctA[i] && correctB[i]) both++;
            else if (correctA[i]) onlyA++;
            else if (correctB[i]) onlyB++;
            else neither++;
        }
        return FromCounts(both, onlyA, onlyB, neither);
    }

    /// <summary>The method is chosen by the discordant count unless <paramref name="method"/> is given.</summary>
    public static McNemarResult FromCounts(int bothRight, int onlyA, int onlyB, int bothWrong, McNemarMethod? method = null)
    {
        foreach (var (name, v) in new[] { (nameof(bothRight), bothRight), (nameof(onlyA), onlyA), (nameof(onlyB), onlyB), (nameof(bothWrong), bothWrong) })
            if (v < 0) throw new ArgumentOutOfRangeException(name, $"{name} = {v} must not be negative.");
        int n = onlyA + onlyB;
        var chosen = method ?? (n < ExactBelow ? McNemarMethod.ExactBinomial : McNemarMethod.ChiSquaredCorrected);
        if (n == 0) return new McNemarResult(bothRight, onlyA, onlyB, bothWrong, chosen, 0, 1);
        double statistic, p;
        switch (chosen)
        {
            case McNemarMethod.ExactBinomial:
                statistic = Math.Min(onlyA, onlyB);
                p = Math.Min(1, 2 * Distributions.BinomialCdf(Math.Min(onlyA, onlyB), n, 0.5));
                break;
            case McNemarMethod.ChiSquaredCorrected:
                double d = Math.Max(0, Math.Abs(onlyA - onlyB) - 1);
                statistic = d * d / n;
                p = Distributions.ChiSquaredOneDfSurvival(statistic);
                break;
            case McNemarMethod.ChiSquared:
                statistic = (double)(onlyA - onlyB) * (onlyA - onlyB) / n;
                p = Distributions.ChiSquaredOneDfSurvival(statistic);
                break;
            default:
                throw new ArgumentOutOfRangeException(nameof(method), $"unknown method {method}");
        }
        return new McNemarResult(bothRight, onlyA, onlyB, bothWrong, chosen, statistic, p);
    }
}
