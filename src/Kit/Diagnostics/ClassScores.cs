namespace Kit.Diagnostics;

/// <summary>One class's one-vs-rest scores. Support is the number of examples whose true class this is.</summary>
public sealed record ClassScores(string Class, double Precision, double Recall, double F1, int Support, int Predicted);
