namespace Kit.Experiments;

/// <summary>
/// The few reference distributions the comparison tests need, written out so the kit carries no statistics
/// dependency: the exact binomial tail, the chi-squared (1 df) tail through the regularised incomplete gamma
/// function, and Student's t through its closed form for integer degrees of freedom.
/// </summary>
public static class Distributions
{
    /// <summary>P(X ≤ k) for X ~ Binomial(n, p), summed exactly in log space so large n does not overflow.</summary>
    public static double BinomialCdf(int k, int n, double p)
    {
        if (n < 0) throw new ArgumentOutOfRangeException(nameof(n), $"n = {n} must not be negative.");
        if (!(p >= 0 && p <= 1)) throw new ArgumentOutOfRangeException(nameof(p), $"p = {p} must lie in [0, 1].");
        if (k < 0) return 0;
        if (k >= n) return 1;
        if (p == 0) return 1;
        if (p == 1) return 0;
        double logP = Math.Log(p), logQ = Math.Log(1 - p), logChoose = 0, sum = 0;
        for (int i = 0; i <= k; i++)
        {
            if (i > 0) logChoose += Math.Log(n - i + 1) - Math.Log(i);
            sum += Math.Exp(logChoose + i * logP + (n - i) * logQ);
        }
        return Math.Min(1, sum);
    }

    /// <summary>P(X ≥ x) for X ~ chi-squared with one degree of freedom: Q(1/2, x/2).</summary>
    public static double ChiSquaredOneDfSurvival(double x)
    {
        if (double.IsNaN(x)) return double.NaN;
        if (x <= 0) return 1;
        return UpperRegularisedGammaHalf(x / 2);
    }

    /// <summary>
    /// Q(1/2, x): the series for P below x = 1.5 and Lentz's continued fraction for Q above (Press et al.,
    /// Numerical Recipes, 3rd ed., §6.2). lnΓ(1/2) = ln √π is exact, so no gamma approximation enters.
    /// </summary>
    static double UpperRegularisedGammaHalf(double x)
    {
        const double a = 0.5, eps = 1e-16, tiny = 1e-300;
        double logPrefix = -x + a * Math.Log(x) - 0.5 * Math.Log(Math.PI);
        if (x < a + 1)
        {
            double ap = a, term = 1 / a, sum = term;
            for (int n = 0; n < 1000 && Math.Abs(term) > Math.Abs(sum) * eps; n++)
            {
                ap += 1;
                term *= x / ap;
                sum += term;
            }
            return 1 - sum * Math.Exp(logPrefix);
        }
        double b = x + 1 - a, c = 1 / tiny, d = 1 / b, h = d;
        for (int i = 1; i < 1000; i++)
        {
            double an = -i * (i - a);
            b += 2;
            d = an * d + b;
            if (Math.Abs(d) < tiny) d = tiny;
            c = b + an / c;
            if (Math.Abs(c) < tiny) c = tiny;
            d = 1 / d;
            double delta = d * c;
            h *= delta;
            if (Math.Abs(delta - 1) < eps) break;
        }
        return Math.Exp(logPrefix) * h;
    }

    /// <summary>
    /// P(T ≤ t) for Student's t with integer <paramref name="df"/>, from the finite series for P(|T| &lt; t)
    /// (Abramowitz and Stegun 1964, 26.7.3 and 26.7.4), exact up to rounding.
    /// </summary>
    public static double StudentTCdf(double t, int df)
    {
        if (df < 1) throw new ArgumentOutOfRangeException(nameof(df), $"df = {df} must be at least 1.");
        if (double.IsNaN(t)) return double.NaN;
        if (double.IsPositiveInfinity(t)) return 1;
        if (double.IsNegativeInfinity(t)) return 0;
        double theta = Math.Atan(Math.Abs(t) / Math.Sqrt(df));
        double s = Math.Sin(theta), c = Math.Cos(theta), c2 = c * c;
        double central;
        if (df % 2 == 1)
        {
            double sum = 0, term = c;
            if (df > 1)
            {
                sum = term;
                for (int k = 3; k <= df - 2; k += 2) { term *= c2 * (k - 1) / k; sum += term; }
            }
            central = 2 / Math.PI * (theta + s * sum);
        }
        else
        {
            double sum = 1, term = 1;
            for (int k = 2; k <= df - 2; k += 2) { term *= c2 * (k - 1) / k; sum += term; }
            central = s * sum;
        }
        double upper = (1 - central) / 2;
        return t >= 0 ? 1 - upper : upper;
    }

    /// <summary>The t quantile for probability <paramref name="p"/>, by bisection on the exact CDF.</summary>
    public static double StudentTQuantile(double p, int df)
    {
        if (!(p > 0 && p < 1)) throw new ArgumentOutOfRangeException(nameof(p), $"p = {p} must lie in (0, 1).");
        if (p < 0.5) return -StudentTQuantile(1 - p, df);
        double lo = 0, hi = 1;
        while (StudentTCdf(hi, df) < p) hi *= 2;
        for (int i = 0; i < 200 && hi - lo > 1e-14 * Math.Max(1, hi); i++)
        {
            double mid = (lo + hi) / 2;
            if (StudentTCdf(mid, df) < p) lo = mid; else hi = mid;
        }
        return (lo + hi) / 2;
    }
}
