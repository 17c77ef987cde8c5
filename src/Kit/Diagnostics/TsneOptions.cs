namespace Kit.Diagnostics;

/// <summary>How the t-SNE layout starts.</summary>
public enum TsneInitialisation
{
    /// <summary>First two principal components, rescaled to standard deviation 1e-4: repeatable and keeps
    /// global structure better than noise (Kobak and Berens 2019, Nature Communications 10:5416).</summary>
    Pca,
    /// <summary>Gaussian noise with standard deviation 1e-4 from the seed (van der Maaten 2014).</summary>
    Random,
}

/// <summary>
/// Settings for <see cref="Tsne.Run(double[][], TsneOptions, IProgress{TsneProgress}?)"/>. Defaults follow van
/// der Maaten (2014), "Accelerating t-SNE using tree-based algorithms": perplexity 30, θ = 0.5, early
/// exaggeration 12 for 250 iterations, momentum 0.5 then 0.8 from iteration 250, 1,000 iterations.
/// </summary>
public sealed record TsneOptions
{
    public double Perplexity { get; init; } = 30;
    public int Iterations { get; init; } = 1000;
    /// <summary>Barnes–Hut accuracy: a cell of width w at distance r is summarised when w / r &lt; θ. 0 = exact.</summary>
    public double Theta { get; init; } = 0.5;
    public double EarlyExaggeration { get; init; } = 12;
    public int ExaggerationIterations { get; init; } = 250;
    /// <summary>
    /// Null picks max(N / EarlyExaggeration / 4, 50). Belkina et al. (2019, Nature Communications; from memory)
    /// recommend N / exaggeration for implementations whose gradient omits the factor 4 of the exact t-SNE
    /// gradient; ours keeps the 4, hence the extra division (the same rule scikit-learn's "auto" applies,
    /// from memory). A fixed 200 under-steps large N and makes the 1,000 iterations too few.
    /// </summary>
    public double? LearningRate { get; init; }
    public double InitialMomentum { get; init; } = 0.5;
    public double FinalMomentum { get; init; } = 0.8;
    public int MomentumSwitchIteration { get; init; } = 250;
    public TsneInitialisation Initialisation { get; init; } = TsneInitialisation.Pca;
    public ulong Seed { get; init; } = 1;
    /// <summary>Report progress (with the KL divergence) every this many iterations; 0 = only at the end.</summary>
    public int ProgressEvery { get; init; } = 50;
    /// <summary>Null = all cores.</summary>
    public int? MaxDegreeOfParallelism { get; init; }

    internal void Validate(int n)
    {
        if (!(Perplexity > 0) || !double.IsFinite(Perplexity)) throw new ArgumentOutOfRangeException(nameof(Perplexity), $"perplexity {Perplexity} must be positive.");
        int needed = (int)Math.Floor(3 * Perplexity) + 1;
        if (n < needed)
            throw new ArgumentException(
                $"perplexity {Perplexity} needs at least {needed} points (3 × perplexity neighbours each) but there are {n}; use perplexity ≤ {Math.Max(1, (n - 1) / 3)}.");
        if (Iterations < 1) throw new ArgumentOutOfRangeException(nameof(Iterations), $"iterations = {Iterations} must be at least 1.");
        if (!(Theta >= 0) || Theta > 2) throw new ArgumentOutOfRangeException(nameof(Theta), $"theta = {Theta} must lie in [0, 2].");
        if (!(EarlyExaggeration >= 1)) throw new ArgumentOutOfRangeException(nameof(EarlyExaggeration), $"early exaggeration {EarlyExaggeration} must be ≥ 1.");
        if (ExaggerationIterations < 0) throw new ArgumentOutOfRangeException(nameof(ExaggerationIterations), "must not be negative.");
        if (LearningRate is double lr && !(lr > 0)) throw new ArgumentOutOfRangeException(nameof(LearningRate), $"learning rate {lr} must be positive.");
        if (ProgressEvery < 0) throw new ArgumentOutOfRangeException(nameof(ProgressEvery), "must not be negative.");
        if (MaxDegreeOfParallelism is int p && p < 1) throw new ArgumentOutOfRangeException(nameof(MaxDegreeOfParallelism), "must be at least 1.");
    }

    internal double LearningRateFor(int n) => LearningRate ?? Math.Max(n / EarlyExaggeration / 4, 50);
}
