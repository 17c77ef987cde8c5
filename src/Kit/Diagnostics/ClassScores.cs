namespace Kit.Diagnostics;

/// <summary>One class's one-vs-rest scores. TrueRows counts the examples whose true class this is; PredictedRows those predicted as it.</summary>
public sealed record ClassScores(string Class, double Precision, double Recall, double F1, int TrueRows, int PredictedRows);
