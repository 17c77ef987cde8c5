namespace Kit.Diagnostics;

/// <summary>
/// Scores of the examples in one bin or group. Lo/Hi are the bin's edges (NaN for a named group); the
/// interval is Wilson's 95 % interval for the accuracy. MacroF1 averages over the classes that occur in the
/// bin as true or predicted label; NaN for an empty bin.
/// </summary>
public sealed record BinScores(string Bin, double Lo, double Hi, int Count, int Correct, double Accuracy,
    double WilsonLow, double WilsonHigh, double MacroF1);
