namespace Kit.Training;

/// <summary>
/// The learning rate as a pure function of (optimiser step, epoch) plus the small plateau state, so a resumed
/// run recomputes exactly the rates the uninterrupted run used.
/// </summary>
public sealed class LearningRateSchedule
{
    readonly ScheduleOptions _options;
    readonly double _peak;
    readonly long _totalSteps;

    /// <summary>Current multiplier from reduce-on-plateau (1 until the first reduction).</summary>
    public double PlateauScale { get; private set; } = 1;
    /// <summary>Epochs since the monitored figure last improved, as reduce-on-plateau counts them.</summary>
    public int PlateauWait { get; private set; }
    public double PlateauBest { get; private set; } = double.NaN;

    public LearningRateSchedule(ScheduleOptions options, double peak, long totalSteps)
    {
        _options = options;
        _peak = peak;
        _totalSteps = Math.Max(totalSteps, 1);
    }

    /// <summary>Rate for the optimiser step with 0-based index <paramref name="step"/> taken in 1-based <paramref name="epoch"/>.</summary>
    public double Rate(long step, int epoch)
    {
        switch (_options.Kind)
        {
            case ScheduleKind.Constant:
                return _peak;
            case ScheduleKind.Step:
                return _peak * Math.Pow(_options.Factor, (epoch - 1) / _options.StepEpochs);
            case ScheduleKind.ReduceOnPlateau:
                return _peak * PlateauScale;
            case ScheduleKind.WarmupCosine:
                long warm = Math.Min(_options.WarmupSteps, _totalSteps);
                if (step < warm) return _peak * (step + 1) / warm;
                long decaySteps = Math.Max(_totalSteps - warm - 1, 1);
                double progress = Math.Min((step - warm) / (double)decaySteps, 1);
                double floor = _peak * _options.MinFactor;
                return floor + (_peak - floor) * 0.5 * (1 + Math.Cos(Math.PI * progress));
            default:
                throw new InvalidOperationException($"unknown schedule {_options.Kind}");
        }
    }

    /// <summary>Feeds reduce-on-plateau the epoch's monitored figure (other schedules ignore it).</summary>
    public void EndOfEpoch(double monitored, bool higherIsBetter, double minImprovement)
    {
        if (_options.Kind != ScheduleKind.ReduceOnPlateau || !double.IsFinite(monitored)) return;
        if (double.IsNaN(PlateauBest) || Improves(monitored, PlateauBest, higherIsBetter, minImprovement))
        {
            PlateauBest = monitored;
            PlateauWait = 0;
            return;
        }
        if (++PlateauWait >= _options.PlateauPatience)
        {
            PlateauScale = Math.Max(PlateauScale * _options.Factor, _options.MinFactor);
            PlateauWait = 0;
        }
    }

    internal static bool Improves(double candidate, double best, bool higherIsBetter, double minImprovement) =>
        higherIsBetter ? candidate > best + minImprovement : candidate < best - minImprovement;

    internal ScheduleState Save() => new(PlateauScale, PlateauWait, double.IsNaN(PlateauBest) ? null : PlateauBest);

    internal void Load(ScheduleState state)
    {
        PlateauScale = state.PlateauScale;
        PlateauWait = state.PlateauWait;
        PlateauBest = state.PlateauBest ?? double.NaN;
    }
}

/// <summary>What a checkpoint keeps of the schedule: only reduce-on-plateau has state beyond the step count.</summary>
internal sealed record ScheduleState(double PlateauScale, int PlateauWait, double? PlateauBest);
