using Kit.Training;

namespace Kit.Tests.Training;

public class ScheduleTests
{
    [Fact]
    public void Warmup_then_cosine_hits_its_landmarks()
    {
        var s = new LearningRateSchedule(new ScheduleOptions { Kind = ScheduleKind.WarmupCosine, WarmupSteps = 4, MinFactor = 0.1 }, 1.0, 14);
        // Linear warm-up: (step + 1) / W.
        Assert.Equal(new[] { 0.25, 0.5, 0.75, 1.0 }, Enumerable.Range(0, 4).Select(i => s.Rate(i, 1)));
        // Cosine from the peak (step 4) to the floor (last step, 13) over 9 steps; halfway the rate is the mean.
        Assert.Equal(1.0, s.Rate(4, 1), 12);
        Assert.Equal(0.1 + 0.9 * 0.5 * (1 + Math.Cos(Math.PI * 3 / 9)), s.Rate(7, 1), 12);
        Assert.Equal(0.1, s.Rate(13, 2), 12);
        for (int i = 5; i < 14; i++) Assert.True(s.Rate(i, 1) < s.Rate(i - 1, 1));
    }

    [Fact]
    public void Step_schedule_multiplies_every_few_epochs()
    {
        var s = new LearningRateSchedule(new ScheduleOptions { Kind = ScheduleKind.Step, StepEpochs = 2, Factor = 0.5 }, 0.8, 100);
        Assert.Equal(new[] { 0.8, 0.8, 0.4, 0.4, 0.2 }, Enumerable.Range(1, 5).Select(e => s.Rate(0, e)));
    }

    [Fact]
    public void Plateau_reduces_after_patience_and_respects_the_floor()
    {
        var s = new LearningRateSchedule(new ScheduleOptions { Kind = ScheduleKind.ReduceOnPlateau, PlateauPatience = 2, Factor = 0.5, MinFactor = 0.2 }, 1.0, 100);
        var rates = new List<double>();
        foreach (double val in new[] { 0.5, 0.6, 0.6, 0.55, 0.7, 0.6, 0.6, 0.6, 0.6, 0.6, 0.6 })
        {
            s.EndOfEpoch(val, higherIsBetter: true, 0);
            rates.Add(s.Rate(0, 1));
        }
        Assert.Equal(new[] { 1.0, 1.0, 1.0, 0.5, 0.5, 0.5, 0.25, 0.25, 0.2, 0.2, 0.2 }, rates);
    }

    [Fact]
    public void Constant_stays_put() =>
        Assert.Equal(3e-3, new LearningRateSchedule(new ScheduleOptions(), 3e-3, 10).Rate(9, 4));
}
