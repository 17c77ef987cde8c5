namespace Kit.Experiments;

/// <summary>
/// Multinomial naive Bayes on n-gram feature rows (counts, or tf-idf weights used as fractional counts — the
/// transformed variant of Rennie, Shih, Teevan and Karger 2003, "Tackling the Poor Assumptions of Naive Bayes Text
/// Classifiers", §4), with additive smoothing: θ_cg = (N_cg + s) / (N_c + s·V), where N_cg sums feature g over class
/// c's training rows, N_c = Σ_g N_cg and V is the number of training n-grams (Manning, Raghavan and Schütze 2008,
/// Introduction to Information Retrieval, §13.2). A row's score for class c is log P(c) + Σ_g x_g log θ_cg; n-grams
/// never seen in training are not features and so are ignored.
/// </summary>
public sealed class NgramNaiveBayes
{
    public int Classes { get; }
    public int Features { get; }
    /// <summary>The additive smoothing s added to every (class, n-gram) total.</summary>
    public double Smoothing { get; }
    readonly double[] _logPrior;
    // Feature-major like the logistic regression: log θ of feature j for every class at [j*K, j*K+K).
    readonly double[] _logTheta;

    NgramNaiveBayes(int classes, int features, double smoothing, double[] logPrior, double[] logTheta)
    {
        Classes = classes; Features = features; Smoothing = smoothing; _logPrior = logPrior; _logTheta = logTheta;
    }

    /// <summary>Stored numbers: one log-probability per (class, n-gram) plus one prior per class.</summary>
    public long ParameterCount => _logTheta.LongLength + Classes;
    public ReadOnlySpan<double> LogPriors => _logPrior;
    public ReadOnlySpan<double> LogThetas => _logTheta;

    public static NgramNaiveBayes FromParts(int classes, int features, double smoothing, double[] logPrior, double[] logTheta)
    {
        if (logPrior.Length != classes || logTheta.Length != (long)classes * features)
            throw new ArgumentException($"expected {classes} priors and {classes}×{features} log θ, got {logPrior.Length} and {logTheta.Length}");
        return new NgramNaiveBayes(classes, features, smoothing, logPrior, logTheta);
    }

    public static NgramNaiveBayes Fit(SparseRows x, IReadOnlyList<int> labels, int classes, double smoothing = 1.0)
    {
        if (x.Count != labels.Count) throw new ArgumentException($"{x.Count} rows but {labels.Count} labels");
        if (x.Count == 0) throw new ArgumentException("no training rows");
        if (classes < 2) throw new ArgumentOutOfRangeException(nameof(classes), $"classes = {classes}; at least 2 are needed");
        if (!(smoothing > 0) || !double.IsFinite(smoothing)) throw new ArgumentOutOfRangeException(nameof(smoothing), $"smoothing = {smoothing} must be positive");
        int k = classes, v = x.Width;
        var totals = new double[(long)v * k];
        var classTotal = new double[k];
        var rowsOf = new int[k];
        for (int r = 0; r < x.Count; r++)
        {
            int c = labels[r];
            if (c < 0 || c >= k) throw new ArgumentOutOfRangeException(nameof(labels), $"labels[{r}] = {c} is outside 0..{k - 1}");
            rowsOf[c]++;
            var columns = x.ColumnsOf(r);
            var values = x.ValuesOf(r);
            for (int t = 0; t < columns.Length; t++)
            {
                totals[(long)columns[t] * k + c] += values[t];
                classTotal[c] += values[t];
            }
        }
        // A class with no training rows gets a vanishing prior rather than −∞, so scores stay finite.
        var logPrior = rowsOf.Select(n => Math.Log(Math.Max(n, 1e-300) / x.Count)).ToArray();
        var denominators = classTotal.Select(t => Math.Log(t + smoothing * v)).ToArray();
        for (long i = 0; i < totals.LongLength; i++) totals[i] = Math.Log(totals[i] + smoothing) - denominators[i % k];
        return new NgramNaiveBayes(k, v, smoothing, logPrior, totals);
    }

    /// <summary>log P(c) + Σ_g x_g log θ_cg for every class: the unnormalised log posterior of one feature row.</summary>
    public double[] ClassLogScores(ReadOnlySpan<int> columns, ReadOnlySpan<double> values)
    {
        var score = (double[])_logPrior.Clone();
        for (int t = 0; t < columns.Length; t++)
        {
            var row = _logTheta.AsSpan(columns[t] * Classes, Classes);
            for (int c = 0; c < Classes; c++) score[c] += values[t] * row[c];
        }
        return score;
    }

    /// <summary>Posterior class probabilities: the class log scores through a softmax, shifted by their maximum for stability.</summary>
    public double[] Probabilities(ReadOnlySpan<int> columns, ReadOnlySpan<double> values)
    {
        var s = ClassLogScores(columns, values);
        double max = s.Max(), sum = 0;
        for (int c = 0; c < s.Length; c++) { s[c] = Math.Exp(s[c] - max); sum += s[c]; }
        for (int c = 0; c < s.Length; c++) s[c] /= sum;
        return s;
    }

    public double[][] Probabilities(SparseRows x) =>
        Enumerable.Range(0, x.Count).Select(r => Probabilities(x.ColumnsOf(r), x.ValuesOf(r))).ToArray();
}
