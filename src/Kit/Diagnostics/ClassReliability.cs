namespace Kit.Diagnostics;

/// <summary>Reliability of one class's probability p_k against the event "true class is k".</summary>
public sealed record ClassReliability(string Class, IReadOnlyList<ReliabilityBin> Bins, double Ece);
