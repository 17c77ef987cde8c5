namespace Kit.Bench;

/// <summary>Every measure the harness knows. Add one line per measure.</summary>
public static class MeasureCatalog
{
    public static IReadOnlyList<IMeasure> All() => new IMeasure[]
    {
        new Training.TrainingRatioMeasure(),
        new Training.ThroughputCeilingMeasure(),
    };
}
