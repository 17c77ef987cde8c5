namespace Kit.Training;

/// <summary>How to train one model. Defaults suit short character sequences on a CPU.</summary>
public sealed record TrainingOptions
{
    public int Epochs { get; init; } = 8;
    public int BatchSize { get; init; } = 64;
    /// <summary>Peak learning rate; the schedule scales it.</summary>
    public double LearningRate { get; init; } = 3e-3;
    public ulong Seed { get; init; } = 1;
    /// <summary>Intra-op threads for the engine; 0 means one per core.</summary>
    public int Threads { get; init; }
    /// <summary>Report progress every this many batches.</summary>
    public int ProgressEvery { get; init; } = 25;
    /// <summary>Use length-bucketed batches (less padding, faster) rather than uniformly random ones.</summary>
    public bool Bucketed { get; init; } = true;

    public OptimizerKind Optimizer { get; init; } = OptimizerKind.Adam;
    /// <summary>L2 penalty for Adam and SGD, decoupled decay for AdamW (0 = none).</summary>
    public double WeightDecay { get; init; }
    /// <summary>SGD momentum (ignored by the Adam family).</summary>
    public double Momentum { get; init; } = 0.9;
    public ScheduleOptions Schedule { get; init; } = new();
    /// <summary>Rescale gradients so their global L2 norm is at most this; null leaves them alone.</summary>
    public double? MaxGradientNorm { get; init; }
    public ClassWeighting ClassWeighting { get; init; } = ClassWeighting.None;
    /// <summary>One weight per class id, used when <see cref="ClassWeighting"/> is Given.</summary>
    public IReadOnlyList<double>? ClassWeights { get; init; }
    /// <summary>Share ε of the target mass spread evenly over all classes (0 = plain one-hot targets).</summary>
    public double LabelSmoothing { get; init; }
    /// <summary>The validation figure that picks the best epoch, drives early stopping and reduce-on-plateau.</summary>
    public MonitorMetric Monitor { get; init; } = MonitorMetric.ValidationAccuracy;
    /// <summary>Stop after this many epochs without improvement of <see cref="Monitor"/>; null trains every epoch.</summary>
    public int? Patience { get; init; }
    /// <summary>An epoch counts as an improvement only when it beats the best by more than this.</summary>
    public double MinImprovement { get; init; }
    /// <summary>Folder for the per-epoch checkpoint (null = no checkpoints).</summary>
    public string? CheckpointDirectory { get; init; }
    /// <summary>Continue from the checkpoint in <see cref="CheckpointDirectory"/> when there is one.</summary>
    public bool Resume { get; init; }

    /// <summary>Throws with every problem found, each naming the option.</summary>
    public TrainingOptions Validate()
    {
        var problems = new List<string>();
        if (Epochs < 1) problems.Add($"Epochs must be at least 1, got {Epochs}");
        if (BatchSize < 1) problems.Add($"BatchSize must be at least 1, got {BatchSize}");
        if (!(LearningRate > 0) || !double.IsFinite(LearningRate)) problems.Add($"LearningRate must be positive, got {LearningRate}");
        if (Threads < 0) problems.Add($"Threads must be 0 (one per core) or positive, got {Threads}");
        if (ProgressEvery < 1) problems.Add($"ProgressEvery must be at least 1, got {ProgressEvery}");
        if (!(WeightDecay >= 0)) problems.Add($"WeightDecay must be non-negative, got {WeightDecay}");
        if (!(Momentum >= 0 && Momentum < 1)) problems.Add($"Momentum must be in [0, 1), got {Momentum}");
        if (MaxGradientNorm is double c && !(c > 0)) problems.Add($"MaxGradientNorm must be positive, got {c}");
        if (!(LabelSmoothing >= 0 && LabelSmoothing < 1)) problems.Add($"LabelSmoothing must be in [0, 1), got {LabelSmoothing}");
        if (Patience is int p && p < 1) problems.Add($"Patience must be at least 1, got {p}");
        if (!(MinImprovement >= 0)) problems.Add($"MinImprovement must be non-negative, got {MinImprovement}");
        if (ClassWeighting == ClassWeighting.Given && ClassWeights is null) problems.Add("ClassWeighting Given needs ClassWeights");
        if (ClassWeights is not null && ClassWeights.Any(w => !(w >= 0) || !double.IsFinite(w))) problems.Add("ClassWeights must be finite and non-negative");
        if (Resume && CheckpointDirectory is null) problems.Add("Resume needs a CheckpointDirectory");
        problems.AddRange(Schedule.Problems());
        if (problems.Count > 0) throw new ArgumentException("invalid training options: " + string.Join("; ", problems));
        return this;
    }
}

public enum OptimizerKind { Adam, AdamW, Sgd }

/// <summary>Inverse frequency gives class c the weight N / (K · n_c), so every class carries the same total weight.</summary>
public enum ClassWeighting { None, InverseFrequency, Given }

public enum MonitorMetric { ValidationLoss, ValidationAccuracy, ValidationMacroF1 }
