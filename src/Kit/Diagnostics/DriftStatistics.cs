namespace Kit.Diagnostics;

/// <summary>
/// The two distances the drift check uses, over binned counts.
/// Population stability index: Σ (a − e)·ln(a / e) over bins, a and e the scored and reference shares; it equals
/// the symmetric (Jeffreys) Kullback–Leibler divergence of the two binned distributions. Empty bins are floored at
/// <see cref="ShareFloor"/> so the logarithm stays finite (common practice, no source).
/// Two-sample Kolmogorov–Smirnov: D = max |F₁ − F₂| over bin edges, which for binned data is the statistic of the
/// binned samples (a lower bound of the unbinned one); the p-value is the asymptotic Kolmogorov distribution
/// Q(λ) = 2 Σ (−1)^(k−1) e^(−2k²λ²) with λ = (√nₑ + 0.12 + 0.11/√nₑ)·D, nₑ = n·m/(n+m) (Press et al.,
/// Numerical Recipes, 3rd ed., §14.3.3).
/// </summary>
public static class DriftStatistics
{
    public const double ShareFloor = 1e-4;

    public static double Psi(IReadOnlyList<double> reference, IReadOnlyList<double> current)
    {
        if (reference.Count != current.Count) throw new ArgumentException($"{reference.Count} reference bins but {current.Count} current bins");
        var e = Shares(reference);
        var a = Shares(current);
        double psi = 0;
        for (int i = 0; i < e.Length; i++)
        {
            double ei = Math.Max(e[i], ShareFloor), ai = Math.Max(a[i], ShareFloor);
            psi += (ai - ei) * Math.Log(ai / ei);
        }
        return psi;
    }

    /// <summary>Largest gap between the two cumulative shares over the same ordered bins.</summary>
    public static double KsStatistic(IReadOnlyList<double> reference, IReadOnlyList<double> current)
    {
        if (reference.Count != current.Count) throw new ArgumentException($"{reference.Count} reference bins but {current.Count} current bins");
        var e = Shares(reference);
        var a = Shares(current);
        double fe = 0, fa = 0, d = 0;
        for (int i = 0; i < e.Length; i++)
        {
            fe += e[i];
            fa += a[i];
            d = Math.Max(d, Math.Abs(fe - fa));
        }
        return d;
    }

    public static double KsPValue(double d, long n, long m)
    {
        if (n < 1 || m < 1) return double.NaN;
        double ne = n * (double)m / (n + m);
        double sqrt = Math.Sqrt(ne);
        return KolmogorovQ((sqrt + 0.12 + 0.11 / sqrt) * d);
    }

    /// <summary>Q(λ) = P(K &gt; λ) of the Kolmogorov distribution, by its alternating series.</summary>
    public static double KolmogorovQ(double lambda)
    {
        if (lambda < 0.2) return 1.0;   // the series converges slowly here and the value is 1 to many digits
        double sum = 0, sign = 1;
        for (int k = 1; k <= 100; k++)
        {
            double term = sign * Math.Exp(-2.0 * k * k * lambda * lambda);
            sum += term;
            if (Math.Abs(term) < 1e-12) break;
            sign = -sign;
        }
        return Math.Clamp(2 * sum, 0, 1);
    }

    static double[] Shares(IReadOnlyList<double> counts)
    {
        double total = counts.Sum();
        return counts.Select(c => total > 0 ? c / total : 0).ToArray();
    }
}
