using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>One position's occlusion score: Drop = p(target | sequence) − p(target | token replaced by unknown).</summary>
public sealed record OcclusionPosition(int Position, int Token, string? TokenText, double OccludedProbability, double Drop);

/// <summary>Per-position occlusion attribution for one sequence. A positive drop means the token supported the target class.</summary>
public sealed record OcclusionResult(int[] Tokens, int TargetClass, double BaseProbability, IReadOnlyList<OcclusionPosition> Positions)
{
    public DataFrame ToDataFrame() => new(
        FrameColumns.Count("Position", Positions.Select(p => p.Position)),
        FrameColumns.Count("Token", Positions.Select(p => p.Token)),
        FrameColumns.Text("TokenText", Positions.Select(p => p.TokenText)),
        FrameColumns.Number("OccludedProbability", Positions.Select(p => p.OccludedProbability)),
        FrameColumns.Number("Drop", Positions.Select(p => p.Drop)));
}
