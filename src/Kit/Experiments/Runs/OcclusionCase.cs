using Kit.Diagnostics;

namespace Kit.Experiments;

/// <summary>
/// One test row explained by occlusion, with what a reader needs beside the scores: why it was picked, its
/// text, the pieces the model saw (one per position) and which of them were unknown to the vocabulary.
/// </summary>
public sealed record OcclusionCase(string Why, string Text, string TrueClass, string PredictedClass, string TargetClass,
    IReadOnlyList<string> Pieces, IReadOnlyList<bool> Unknown, OcclusionResult Result);
