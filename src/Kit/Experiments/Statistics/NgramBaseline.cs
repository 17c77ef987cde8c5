using System.Globalization;

namespace Kit.Experiments;

/// <summary>The two n-gram baselines every comparison carries.</summary>
public enum BaselineKind { NaiveBayes, LogisticRegression }

/// <summary>
/// An n-gram baseline as one value: the features fitted on the training rows and the classifier on top, reading
/// token sequences and giving the same per-row class-probability arrays as a neural model's softmax, so every
/// diagnostic and paired test treats it like any other model.
/// </summary>
public sealed class NgramBaseline
{
    /// <summary>Naive Bayes smoothing when none is given: measured on the demo sets and WordNet (docs/benchmarks.md).</summary>
    public const double DefaultSmoothing = 0.1;
    /// <summary>Logistic regression L2 strength when none is given (the optimum of C = 1 in the usual formulation).</summary>
    public const double DefaultL2 = 1.0;

    public BaselineKind Kind { get; }
    public NgramFeatures Features { get; }
    public NgramNaiveBayes? NaiveBayes { get; }
    public NgramLogisticRegression? LogisticRegression { get; }
    public int Classes => NaiveBayes?.Classes ?? LogisticRegression!.Classes;

    internal NgramBaseline(NgramFeatures features, NgramNaiveBayes? naiveBayes, NgramLogisticRegression? logisticRegression)
    {
        Features = features;
        NaiveBayes = naiveBayes;
        LogisticRegression = logisticRegression;
        Kind = naiveBayes is not null ? BaselineKind.NaiveBayes : BaselineKind.LogisticRegression;
    }

    public static NgramBaseline Fit(BaselineKind kind, IReadOnlyList<IReadOnlyList<string>> tokens, IReadOnlyList<int> labels, int classes,
        NgramScheme scheme, double smoothing = DefaultSmoothing, double l2 = DefaultL2)
    {
        if (tokens.Count != labels.Count) throw new ArgumentException($"{tokens.Count} sequences but {labels.Count} labels");
        var features = NgramFeatures.Fit(tokens, scheme);
        var x = features.Transform(tokens);
        return kind switch
        {
            BaselineKind.NaiveBayes => new NgramBaseline(features, NgramNaiveBayes.Fit(x, labels, classes, smoothing), null),
            BaselineKind.LogisticRegression => new NgramBaseline(features, null, NgramLogisticRegression.Fit(x, labels, classes, l2)),
            _ => throw new ArgumentOutOfRangeException(nameof(kind), kind, "unknown baseline"),
        };
    }

    /// <summary>Class probabilities per token sequence, in order.</summary>
    public double[][] Probabilities(IReadOnlyList<IReadOnlyList<string>> tokens)
    {
        var x = Features.Transform(tokens);
        return NaiveBayes is not null ? NaiveBayes.Probabilities(x) : LogisticRegression!.Probabilities(x);
    }

    public long ParameterCount => (NaiveBayes?.ParameterCount ?? LogisticRegression!.ParameterCount) + Features.Count;

    /// <summary>One line for run records and report tables.</summary>
    public string Description
    {
        get
        {
            var inv = CultureInfo.InvariantCulture;
            return NaiveBayes is not null
                ? string.Create(inv, $"multinomial naive Bayes on {Features.Scheme} ({Features.Count} n-grams), smoothing {NaiveBayes.Smoothing}")
                : string.Create(inv, $"multinomial logistic regression on {Features.Scheme} ({Features.Count} n-grams), L2 {LogisticRegression!.L2}, {LogisticRegression.Iterations} L-BFGS iterations{(LogisticRegression.Converged ? "" : " (not converged)")}");
        }
    }
}
