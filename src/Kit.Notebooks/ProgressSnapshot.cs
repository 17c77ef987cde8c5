namespace Kit.Notebooks;

/// <summary>
/// One moment of a training run as the notebook draws it. Epoch and batch are 1-based counts of what has finished.
/// <see cref="Eta"/> may be left null; <see cref="LiveProgress{T}"/> then estimates it from the elapsed time.
/// </summary>
public sealed record ProgressSnapshot(
    int Epoch,
    int Epochs,
    int Batch,
    int Batches,
    double Loss,
    double? ValidationMetric = null,
    TimeSpan? Eta = null,
    string MetricName = "validation")
{
    /// <summary>Share of all batches of all epochs that has finished, in [0, 1].</summary>
    public double Fraction
    {
        get
        {
            if (Epochs <= 0) return 0;
            double perEpoch = Batches > 0 ? Math.Clamp((double)Batch / Batches, 0, 1) : 1;
            return Math.Clamp((Math.Max(Epoch, 1) - 1 + perEpoch) / Epochs, 0, 1);
        }
    }

    public bool IsFinal => Epochs > 0 && Epoch >= Epochs && (Batches <= 0 || Batch >= Batches);
}
