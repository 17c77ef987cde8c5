namespace Kit.Diagnostics;

/// <summary>
/// Wilson score interval for a binomial proportion (Wilson 1927; method 3 in Newcombe 1998, Statistics in
/// Medicine 17:857–872). Chosen over the Wald interval because per-bin counts are often small and accuracies
/// near 0 or 1, where Wald collapses to zero width or leaves [0, 1].
/// </summary>
public static class Wilson
{
    /// <summary>Returns (Low, High); z defaults to the 97.5 % normal quantile, giving a 95 % interval.</summary>
    public static (double Low, double High) Interval(int successes, int n, double z = 1.959963984540054)
    {
        if (n < 0) throw new ArgumentOutOfRangeException(nameof(n), $"n = {n} must not be negative.");
        if (successes < 0 || successes > n)
            throw new ArgumentOutOfRangeException(nameof(successes), $"successes = {successes} must lie in 0..n = {n}.");
        if (!(z > 0) || !double.IsFinite(z)) throw new ArgumentOutOfRangeException(nameof(z), $"z = {z} must be positive and finite.");
        if (n == 0) return (double.NaN, double.NaN);
        double p = (double)successes / n, z2 = z * z;
        double denominator = 1 + z2 / n;
        double centre = (p + z2 / (2 * n)) / denominator;
        double half = z * Math.Sqrt(p * (1 - p) / n + z2 / (4.0 * n * n)) / denominator;
        // At 0 or n successes the bound is exactly 0 or 1; clamping removes rounding residue.
        double low = successes == 0 ? 0 : Math.Max(0, centre - half);
        double high = successes == n ? 1 : Math.Min(1, centre + half);
        return (low, high);
    }
}
