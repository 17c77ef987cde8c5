namespace Kit.Experiments;

/// <summary>
/// Multinomial naive Bayes over token n-grams (character n-grams with a character tokenizer, word n-grams
/// with a word tokenizer), with additive (Lidstone) smoothing: θ_cg = (N_cg + α) / (N_c + α·V), where V is the
/// number of distinct training n-grams (Manning, Raghavan and Schütze 2008, Introduction to Information
/// Retrieval, §13.2). N-grams never seen in training are ignored at prediction time, as that formulation does.
/// Sequences are padded with start/end marks so prefixes and suffixes count as n-grams of their own.
/// </summary>
public sealed class NgramNaiveBayes
{
    const string Start = "\u0002", End = "\u0003", Join = "\u0001";

    public int MinN { get; }
    public int MaxN { get; }
    public double Alpha { get; }
    public int Classes { get; }
    readonly double[] _logPrior;
    readonly Dictionary<string, double[]> _logLikelihood;
    readonly double[] _logUnseen;

    /// <summary>Stored numbers: one log-probability per (class, n-gram) plus one prior per class.</summary>
    public long ParameterCount => (long)_logLikelihood.Count * Classes + Classes;
    public int NgramCount => _logLikelihood.Count;

    NgramNaiveBayes(int minN, int maxN, double alpha, int classes, double[] logPrior, Dictionary<string, double[]> logLikelihood, double[] logUnseen)
    {
        MinN = minN; MaxN = maxN; Alpha = alpha; Classes = classes;
        _logPrior = logPrior; _logLikelihood = logLikelihood; _logUnseen = logUnseen;
    }

    public static NgramNaiveBayes Fit(IReadOnlyList<IReadOnlyList<string>> tokens, IReadOnlyList<int> labels, int classes,
        int minN = 1, int maxN = 3, double alpha = 1.0)
    {
        if (tokens.Count != labels.Count) throw new ArgumentException($"{tokens.Count} sequences but {labels.Count} labels");
        if (tokens.Count == 0) throw new ArgumentException("no training sequences");
        if (classes < 2) throw new ArgumentOutOfRangeException(nameof(classes), $"classes = {classes}; at least 2 are needed");
        if (minN < 1 || maxN < minN) throw new ArgumentOutOfRangeException(nameof(minN), $"n-gram range {minN}..{maxN} is empty or starts below 1");
        if (!(alpha > 0) || !double.IsFinite(alpha)) throw new ArgumentOutOfRangeException(nameof(alpha), $"alpha = {alpha} must be positive");
        var counts = new Dictionary<string, double[]>(StringComparer.Ordinal);
        var docs = new int[classes];
        var total = new double[classes];
        for (int i = 0; i < tokens.Count; i++)
        {
            int c = labels[i];
            if (c < 0 || c >= classes) throw new ArgumentOutOfRangeException(nameof(labels), $"labels[{i}] = {c} is outside 0..{classes - 1}");
            docs[c]++;
            foreach (var g in Ngrams(tokens[i], minN, maxN))
            {
                if (!counts.TryGetValue(g, out var row)) counts[g] = row = new double[classes];
                row[c]++;
                total[c]++;
            }
        }
        int v = counts.Count;
        var logPrior = docs.Select(d => Math.Log(Math.Max(d, 1e-300) / tokens.Count)).ToArray();
        var denominators = total.Select(t => Math.Log(t + alpha * v)).ToArray();
        foreach (var row in counts.Values)
            for (int c = 0; c < classes; c++) row[c] = Math.Log(row[c] + alpha) - denominators[c];
        var logUnseen = denominators.Select(d => Math.Log(alpha) - d).ToArray();
        return new NgramNaiveBayes(minN, maxN, alpha, classes, logPrior, counts, logUnseen);
    }

    /// <summary>Joint log-likelihood log P(c) + Σ log θ_cg for every class (unnormalised log posterior).</summary>
    public double[] JointLogLikelihood(IReadOnlyList<string> tokens)
    {
        var score = (double[])_logPrior.Clone();
        foreach (var g in Ngrams(tokens, MinN, MaxN))
            if (_logLikelihood.TryGetValue(g, out var row))
                for (int c = 0; c < Classes; c++) score[c] += row[c];
        return score;
    }

    /// <summary>Posterior class probabilities (softmax of the joint log-likelihoods, shifted for stability).</summary>
    public double[] Probabilities(IReadOnlyList<string> tokens)
    {
        var s = JointLogLikelihood(tokens);
        double max = s.Max(), sum = 0;
        for (int c = 0; c < s.Length; c++) { s[c] = Math.Exp(s[c] - max); sum += s[c]; }
        for (int c = 0; c < s.Length; c++) s[c] /= sum;
        return s;
    }

    /// <summary>log θ of an n-gram never seen with class c in training (what smoothing gives it).</summary>
    public double LogUnseen(int c) => _logUnseen[c];

    /// <summary>The n-grams of a sequence with start/end marks; n-grams made only of marks are left out.</summary>
    public static IEnumerable<string> Ngrams(IReadOnlyList<string> tokens, int minN, int maxN)
    {
        var padded = new string[tokens.Count + 2];
        padded[0] = Start;
        for (int i = 0; i < tokens.Count; i++) padded[i + 1] = tokens[i];
        padded[^1] = End;
        for (int n = minN; n <= maxN; n++)
            for (int i = 0; i + n <= padded.Length; i++)
            {
                // A unigram of a mark says nothing about the text; longer n-grams with a mark mark a prefix or suffix.
                if (n == 1 && (i == 0 || i == padded.Length - 1)) continue;
                yield return n == 1 ? padded[i] : string.Join(Join, padded, i, n);
            }
    }
}
