namespace Kit.Experiments;

/// <summary>
/// How much work the report's diagnostics may do. The defaults suit a full report; <see cref="Quick"/> keeps a
/// demo run near a minute on two cores by projecting fewer points with fewer t-SNE iterations and drawing
/// fewer bootstrap resamples for the ECE interval.
/// </summary>
public sealed record DiagnosticsOptions
{
    /// <summary>Confidence bins of the reliability diagrams and ECE.</summary>
    public int ReliabilityBins { get; init; } = 15;
    /// <summary>Bootstrap resamples for the ECE and test macro F1 intervals (0 skips them).</summary>
    public int BootstrapReplicates { get; init; } = 1000;
    /// <summary>Quantile bins of token length for accuracy by length (repeated edges merge, so fewer may result).</summary>
    public int LengthBins { get; init; } = 8;
    /// <summary>At most this many test rows go into the t-SNE picture (a class-stratified, seeded sample).</summary>
    public int ProjectionMaxPoints { get; init; } = 2000;
    public int TsneIterations { get; init; } = 1000;
    public double TsnePerplexity { get; init; } = 30;
    /// <summary>Rows in each error table.</summary>
    public int ErrorRows { get; init; } = 15;
    /// <summary>Test rows explained by occlusion (0 to 3: the surest mistake, the right call nearest the decision boundary, then a sure right call).</summary>
    public int OcclusionExamples { get; init; } = 3;
    public ulong Seed { get; init; } = 1;

    public static DiagnosticsOptions Quick => new() { ProjectionMaxPoints = 1000, TsneIterations = 400, BootstrapReplicates = 300 };

    internal void Validate()
    {
        if (ReliabilityBins < 1) throw new ArgumentOutOfRangeException(nameof(ReliabilityBins), $"{ReliabilityBins} reliability bins; at least one is needed.");
        if (BootstrapReplicates < 0) throw new ArgumentOutOfRangeException(nameof(BootstrapReplicates), "must not be negative.");
        if (LengthBins < 1) throw new ArgumentOutOfRangeException(nameof(LengthBins), $"{LengthBins} length bins; at least one is needed.");
        if (ProjectionMaxPoints < 0) throw new ArgumentOutOfRangeException(nameof(ProjectionMaxPoints), "must not be negative (0 skips the projection).");
        if (TsneIterations < 1) throw new ArgumentOutOfRangeException(nameof(TsneIterations), "at least one iteration is needed.");
        if (!(TsnePerplexity > 0)) throw new ArgumentOutOfRangeException(nameof(TsnePerplexity), $"perplexity {TsnePerplexity} must be positive.");
        if (ErrorRows < 1) throw new ArgumentOutOfRangeException(nameof(ErrorRows), "at least one row is needed.");
        if (OcclusionExamples is < 0 or > 3) throw new ArgumentOutOfRangeException(nameof(OcclusionExamples), $"{OcclusionExamples}; choose 0 to 3.");
    }
}
