namespace Kit.Training;

/// <summary>How to train one model. Defaults suit short character sequences on a CPU.</summary>
public sealed record TrainingOptions
{
    public int Epochs { get; init; } = 8;
    public int BatchSize { get; init; } = 64;
    public double LearningRate { get; init; } = 3e-3;
    public ulong Seed { get; init; } = 1;
    /// <summary>Intra-op threads for the engine; 0 means one per core.</summary>
    public int Threads { get; init; }
    /// <summary>Report progress every this many batches.</summary>
    public int ProgressEvery { get; init; } = 25;
    /// <summary>Use length-bucketed batches (less padding, faster) rather than uniformly random ones.</summary>
    public bool Bucketed { get; init; } = true;
}
