namespace Kit.Diagnostics;

/// <summary>
/// Temperature scaling (Guo et al. 2017, section 4.2): one scalar T divides every logit; T is chosen to minimise
/// the validation negative log-likelihood. Written in s = 1/T the NLL is convex — its second derivative is the
/// mean variance of the logits under the softmax — so a safeguarded Newton search on its derivative finds the
/// global minimum without a learning rate or a starting guess.
/// </summary>
public static class TemperatureScaling
{
    /// <summary>The search range for T. A fit at a bound means the validation set gives no interior optimum
    /// (e.g. every example right with a wide margin pushes T towards 0).</summary>
    public const double MinTemperature = 0.01, MaxTemperature = 100;

    public static double Fit(double[][] validationLogits, int[] validationLabels)
    {
        CheckLogits(validationLogits, validationLabels, nameof(validationLogits), nameof(validationLabels));
        double lo = 1 / MaxTemperature, hi = 1 / MinTemperature;
        var (gLo, _) = Derivatives(validationLogits, validationLabels, lo);
        if (gLo >= 0) return MaxTemperature;
        var (gHi, _) = Derivatives(validationLogits, validationLabels, hi);
        if (gHi <= 0) return MinTemperature;
        double s = 1;
        for (int iter = 0; iter < 200; iter++)
        {
            var (g, h) = Derivatives(validationLogits, validationLabels, s);
            if (g == 0) break;
            if (g < 0) lo = s; else hi = s;
            double next = h > 0 ? s - g / h : double.NaN;
            // Newton when it stays inside the bracket, bisection otherwise.
            if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
            if (Math.Abs(next - s) <= 1e-13 * Math.Max(1, s) || hi - lo <= 1e-13 * hi) { s = next; break; }
            s = next;
        }
        return 1 / s;
    }

    /// <summary>softmax(logits / t) per row, computed stably.</summary>
    public static double[][] Apply(double[][] logits, double t)
    {
        ArgumentNullException.ThrowIfNull(logits);
        if (!(t > 0) || !double.IsFinite(t)) throw new ArgumentOutOfRangeException(nameof(t), $"temperature {t} must be positive and finite.");
        InputChecks.FiniteMatrix(logits, nameof(logits));
        return logits.Select(z => Softmax(z, 1 / t)).ToArray();
    }

    /// <summary>Mean negative log-likelihood of the labels under softmax(logits / t).</summary>
    public static double NegativeLogLikelihood(double[][] logits, int[] labels, double t)
    {
        CheckLogits(logits, labels, nameof(logits), nameof(labels));
        if (!(t > 0) || !double.IsFinite(t)) throw new ArgumentOutOfRangeException(nameof(t), $"temperature {t} must be positive and finite.");
        double s = 1 / t, sum = 0;
        for (int i = 0; i < logits.Length; i++) sum += LogSumExp(logits[i], s) - s * logits[i][labels[i]];
        return sum / logits.Length;
    }

    internal static double[] Softmax(double[] z, double s)
    {
        double lse = LogSumExp(z, s);
        var p = new double[z.Length];
        for (int c = 0; c < z.Length; c++) p[c] = Math.Exp(s * z[c] - lse);
        return p;
    }

    static double LogSumExp(double[] z, double s)
    {
        double max = double.NegativeInfinity;
        foreach (double v in z) max = Math.Max(max, s * v);
        double sum = 0;
        foreach (double v in z) sum += Math.Exp(s * v - max);
        return max + Math.Log(sum);
    }

    /// <summary>First and second derivative of the mean NLL with respect to s = 1/T.</summary>
    static (double Gradient, double Curvature) Derivatives(double[][] logits, int[] labels, double s)
    {
        double g = 0, h = 0;
        for (int i = 0; i < logits.Length; i++)
        {
            var z = logits[i];
            var p = Softmax(z, s);
            double mean = 0, second = 0;
            for (int c = 0; c < z.Length; c++) { mean += p[c] * z[c]; second += p[c] * z[c] * z[c]; }
            g += mean - z[labels[i]];
            h += Math.Max(0, second - mean * mean);
        }
        return (g / logits.Length, h / logits.Length);
    }

    internal static int CheckLogits(double[][] logits, int[] labels, string logitsName, string labelsName)
    {
        ArgumentNullException.ThrowIfNull(logits, logitsName);
        InputChecks.NotEmpty(labels, labelsName);
        InputChecks.SameLength(labels.Length, labelsName, logits.Length, logitsName);
        InputChecks.FiniteMatrix(logits, logitsName);
        int k = logits[0].Length;
        if (k < 2) throw new ArgumentException($"{logitsName} has {k} column(s); at least two classes are needed.", logitsName);
        InputChecks.Labels(labels, k, labelsName);
        return k;
    }
}
