namespace Kit.Diagnostics;

/// <summary>
/// One example picked for review. Confidence is the probability of the predicted class; Loss is −ln of the
/// probability given to the true class (floored like <see cref="ClassificationMetrics.LogLoss"/>).
/// </summary>
public sealed record ErrorExample(int Index, string Text, string TrueClass, string PredictedClass, double Confidence,
    double TrueClassProbability, double Loss);
