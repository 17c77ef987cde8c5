namespace Kit.Diagnostics;

/// <summary>
/// One bin of a reliability diagram. For equal-width bins Lo/Hi are the bin's edges; for equal-mass bins they
/// are the smallest and largest confidence inside it. Accuracy is the observed frequency of the event the
/// confidence is about (top-label correct, or "true class is k" for a classwise bin). Empty bins carry NaN.
/// </summary>
public sealed record ReliabilityBin(double Lo, double Hi, int Count, double MeanConfidence, double Accuracy)
{
    public double Gap => Accuracy - MeanConfidence;
}
