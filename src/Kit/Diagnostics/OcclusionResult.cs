using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// One position's occlusion score: Drop = p(target | sequence) − p(target | token replaced by unknown), and the same
/// in log-odds: LogOddsDrop = logit(target | sequence) − logit(target | token hidden), logit(p) = log p − log(1 − p).
/// </summary>
public sealed record OcclusionPosition(int Position, int Token, string? TokenText, double OccludedProbability, double Drop,
    double OccludedLogOdds, double LogOddsDrop);

/// <summary>
/// Per-position occlusion attribution for one sequence. A positive drop means the token supported the target class.
/// BaseLogOdds is log p − log(1 − p) of the target on the unmodified sequence (natural log, p clamped to [1e-15, 1 − 1e-15]).
/// </summary>
public sealed record OcclusionResult(int[] Tokens, int TargetClass, double BaseProbability, IReadOnlyList<OcclusionPosition> Positions, double BaseLogOdds)
{
    public DataFrame ToDataFrame() => new(
        FrameColumns.Count("Position", Positions.Select(p => p.Position)),
        FrameColumns.Count("Token", Positions.Select(p => p.Token)),
        FrameColumns.Text("TokenText", Positions.Select(p => p.TokenText)),
        FrameColumns.Number("OccludedProbability", Positions.Select(p => p.OccludedProbability)),
        FrameColumns.Number("Drop", Positions.Select(p => p.Drop)),
        FrameColumns.Number("OccludedLogOdds", Positions.Select(p => p.OccludedLogOdds)),
        FrameColumns.Number("LogOddsDrop", Positions.Select(p => p.LogOddsDrop)));
}
