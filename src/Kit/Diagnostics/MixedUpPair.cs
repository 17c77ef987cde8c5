namespace Kit.Diagnostics;

/// <summary>A (true, predicted) pair of different classes, how often it occurred, and its most confident examples.</summary>
public sealed record MixedUpPair(string TrueClass, string PredictedClass, int Count, double ShareOfTrueClass, IReadOnlyList<ErrorExample> Examples);
