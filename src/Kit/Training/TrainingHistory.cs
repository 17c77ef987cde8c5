using Microsoft.Data.Analysis;

namespace Kit.Training;

/// <summary>What one epoch did. Wall time and throughput are kept apart from the metrics on purpose.</summary>
public sealed record EpochRecord(
    int Epoch,
    double TrainLoss,
    double TrainAccuracy,
    double ValidationLoss,
    double ValidationAccuracy,
    double LearningRate,
    double Seconds,
    double SequencesPerSecond);

/// <summary>The per-epoch record of a training run, plus which epoch's weights the model ended with.</summary>
public sealed class TrainingHistory
{
    public List<EpochRecord> Epochs { get; } = new();
    public int BestEpoch { get; set; }
    public string? StopReason { get; set; }

    public DataFrame ToDataFrame()
    {
        return new DataFrame(
            new Int32DataFrameColumn("epoch", Epochs.Select(e => e.Epoch)),
            new DoubleDataFrameColumn("train_loss", Epochs.Select(e => e.TrainLoss)),
            new DoubleDataFrameColumn("train_accuracy", Epochs.Select(e => e.TrainAccuracy)),
            new DoubleDataFrameColumn("validation_loss", Epochs.Select(e => e.ValidationLoss)),
            new DoubleDataFrameColumn("validation_accuracy", Epochs.Select(e => e.ValidationAccuracy)),
            new DoubleDataFrameColumn("learning_rate", Epochs.Select(e => e.LearningRate)),
            new DoubleDataFrameColumn("seconds", Epochs.Select(e => e.Seconds)),
            new DoubleDataFrameColumn("sequences_per_second", Epochs.Select(e => e.SequencesPerSecond)));
    }
}

/// <summary>A progress tick: where the run is and how long the rest should take.</summary>
public sealed record TrainingProgress(int Epoch, int Epochs, int Batch, int Batches, double Loss, double? ValidationAccuracy, TimeSpan Eta);
