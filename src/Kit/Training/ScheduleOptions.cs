namespace Kit.Training;

public enum ScheduleKind { Constant, WarmupCosine, Step, ReduceOnPlateau }

/// <summary>
/// How the learning rate moves. WarmupCosine rises linearly over <see cref="WarmupSteps"/> optimiser steps and
/// then follows half a cosine down to <see cref="MinFactor"/> × peak at the last step. Step multiplies by
/// <see cref="Factor"/> every <see cref="StepEpochs"/> epochs. ReduceOnPlateau multiplies by <see cref="Factor"/>
/// after <see cref="PlateauPatience"/> epochs without improvement of the monitored validation figure, never going
/// below <see cref="MinFactor"/> × peak.
/// </summary>
public sealed record ScheduleOptions
{
    public ScheduleKind Kind { get; init; } = ScheduleKind.Constant;
    public int WarmupSteps { get; init; } = 100;
    public double MinFactor { get; init; } = 0.01;
    public int StepEpochs { get; init; } = 3;
    public double Factor { get; init; } = 0.5;
    public int PlateauPatience { get; init; } = 1;

    internal IEnumerable<string> Problems()
    {
        if (WarmupSteps < 0) yield return $"Schedule.WarmupSteps must be non-negative, got {WarmupSteps}";
        if (!(MinFactor >= 0 && MinFactor <= 1)) yield return $"Schedule.MinFactor must be in [0, 1], got {MinFactor}";
        if (StepEpochs < 1) yield return $"Schedule.StepEpochs must be at least 1, got {StepEpochs}";
        if (!(Factor > 0 && Factor < 1)) yield return $"Schedule.Factor must be in (0, 1), got {Factor}";
        if (PlateauPatience < 1) yield return $"Schedule.PlateauPatience must be at least 1, got {PlateauPatience}";
    }
}
