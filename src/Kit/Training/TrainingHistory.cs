using Microsoft.Data.Analysis;

namespace Kit.Training;

/// <summary>
/// What one epoch did. Validation figures are plain (unweighted, unsmoothed) cross-entropy, accuracy and macro F1,
/// NaN without a validation set; the train loss is the objective actually minimised. Wall time and throughput are
/// the only figures that differ between two runs with the same seed.
/// </summary>
public sealed record EpochRecord(
    int Epoch,
    double TrainLoss,
    double TrainAccuracy,
    double ValidationLoss,
    double ValidationAccuracy,
    double LearningRate,
    double Seconds,
    double SequencesPerSecond,
    double ValidationMacroF1 = double.NaN,
    double MeanGradientNorm = double.NaN,
    int ClippedBatches = 0);

/// <summary>Why a run ended.</summary>
public enum StopKind { Completed, EarlyStopped, Diverged, Cancelled }

/// <summary>The per-epoch record of a training run, plus which epoch's weights the model ended with.</summary>
public sealed class TrainingHistory
{
    public List<EpochRecord> Epochs { get; } = new();
    /// <summary>The epoch whose weights the model holds at the end (0 when no epoch finished).</summary>
    public int BestEpoch { get; set; }
    public MonitorMetric Monitor { get; set; } = MonitorMetric.ValidationAccuracy;
    public StopKind Stop { get; set; } = StopKind.Completed;
    /// <summary>A sentence for people when the run did not simply run all its epochs; null otherwise.</summary>
    public string? StopReason { get; set; }
    /// <summary>The last epoch read back from a checkpoint, when the run was resumed.</summary>
    public int? ResumedAfterEpoch { get; set; }

    public DataFrame ToDataFrame()
    {
        return new DataFrame(
            new Int32DataFrameColumn("epoch", Epochs.Select(e => e.Epoch)),
            new DoubleDataFrameColumn("train_loss", Epochs.Select(e => e.TrainLoss)),
            new DoubleDataFrameColumn("train_accuracy", Epochs.Select(e => e.TrainAccuracy)),
            new DoubleDataFrameColumn("validation_loss", Epochs.Select(e => e.ValidationLoss)),
            new DoubleDataFrameColumn("validation_accuracy", Epochs.Select(e => e.ValidationAccuracy)),
            new DoubleDataFrameColumn("validation_macro_f1", Epochs.Select(e => e.ValidationMacroF1)),
            new DoubleDataFrameColumn("learning_rate", Epochs.Select(e => e.LearningRate)),
            new DoubleDataFrameColumn("mean_gradient_norm", Epochs.Select(e => e.MeanGradientNorm)),
            new Int32DataFrameColumn("clipped_batches", Epochs.Select(e => e.ClippedBatches)),
            new DoubleDataFrameColumn("seconds", Epochs.Select(e => e.Seconds)),
            new DoubleDataFrameColumn("sequences_per_second", Epochs.Select(e => e.SequencesPerSecond)));
    }
}

/// <summary>A progress tick: where the run is and how long the rest should take.</summary>
public sealed record TrainingProgress(int Epoch, int Epochs, int Batch, int Batches, double Loss, double? ValidationAccuracy, TimeSpan Eta,
    double LearningRate = double.NaN);
