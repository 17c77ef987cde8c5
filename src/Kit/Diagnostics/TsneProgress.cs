namespace Kit.Diagnostics;

/// <summary>One progress report: KL(P‖Q) of the current layout (against the un-exaggerated P).</summary>
public sealed record TsneProgress(int Iteration, int Iterations, double KlDivergence, bool Exaggerating, TimeSpan Elapsed);
