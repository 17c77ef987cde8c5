namespace Kit.Bench;

/// <summary>Every measure the harness knows. Add one line per measure.</summary>
public static class MeasureCatalog
{
    public static IReadOnlyList<IMeasure> All() => new IMeasure[]
    {
        new Data.CsvLoadMeasure(),
        new Diagnostics.TsneMeasure(),
        new Diagnostics.PcaMeasure(),
        new Batching.PadWasteMeasure(),
        new Batching.EpochSpeedupMeasure(),
        new Training.TrainingRatioMeasure(),
        new Training.EncoderThroughputMeasure(),
        new Training.ThroughputCeilingMeasure(),
        new Onnx.OnnxScoringMeasure(),
        new Experiments.SearchMeasure(),
    };
}
