namespace Kit.Diagnostics;

/// <summary>One projected point with what it stands for: a token (Text) or a sequence (Text, Label, Correct).</summary>
public sealed record ProjectionPoint(double X, double Y, string? Label, string? Text, bool? Correct);
