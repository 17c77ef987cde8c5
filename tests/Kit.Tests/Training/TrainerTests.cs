using Kit.Training;

namespace Kit.Tests.Training;

[Collection(EngineRandomCollection.Name)]
public sealed class TrainerTests : IDisposable
{
    readonly string _dir = Path.Combine(Path.GetTempPath(), "kit-trainer-" + Guid.NewGuid().ToString("N"));

    public void Dispose()
    {
        if (Directory.Exists(_dir)) Directory.Delete(_dir, recursive: true);
    }

    static readonly Kit.Data.EncodedSet Train = TinySets.Make(240, 11);
    static readonly Kit.Data.EncodedSet Validation = TinySets.Make(90, 12);

    static TrainingOptions Options(int epochs = 4) => new()
    {
        Epochs = epochs, BatchSize = 32, LearningRate = 0.02, Seed = 5, Optimizer = OptimizerKind.AdamW, WeightDecay = 0.01,
        Schedule = new ScheduleOptions { Kind = ScheduleKind.WarmupCosine, WarmupSteps = 5 }, MaxGradientNorm = 1.0,
        LabelSmoothing = 0.05, ProgressEvery = 1,
    };

    [Fact]
    public void Same_seed_gives_identical_weights_and_history()
    {
        var a = TinySets.Model();
        var ha = Trainer.Fit(a, Train, Validation, Options());
        var b = TinySets.Model();
        var hb = Trainer.Fit(b, Train, Validation, Options());
        TinySets.AssertSameWeights(a, b);
        Assert.Equal(TinySets.Numbers(ha), TinySets.Numbers(hb));
        Assert.Equal(4, ha.Epochs.Count);
        // The run learned something, so the comparison above is of real training, not of untouched weights.
        Assert.True(ha.Epochs[^1].TrainLoss < ha.Epochs[0].TrainLoss);
        var c = TinySets.Model();
        var hc = Trainer.Fit(c, Train, Validation, Options() with { Seed = 6 });
        Assert.NotEqual(TinySets.Numbers(ha), TinySets.Numbers(hc));
    }

    [Fact]
    public void Resume_after_a_stop_equals_the_uninterrupted_run()
    {
        var straight = TinySets.Model();
        var hs = Trainer.Fit(straight, Train, Validation, Options());

        var options = Options() with { CheckpointDirectory = _dir, Resume = true };
        using var cancel = new CancellationTokenSource();
        // Stop as soon as epoch 3 starts: epochs 1-2 are checkpointed, the partial epoch 3 is lost (as with a kill).
        var stopper = new Progress(p => { if (p.Epoch == 3) cancel.Cancel(); });
        var first = TinySets.Model();
        var h1 = Trainer.Fit(first, Train, Validation, options, stopper, cancel.Token);
        Assert.Equal(StopKind.Cancelled, h1.Stop);
        Assert.Equal(2, h1.Epochs.Count);

        // A fresh process would build the model from a different initialisation; the checkpoint must win.
        var resumed = TinySets.Model(initSeed: 99);
        var h2 = Trainer.Fit(resumed, Train, Validation, options);
        Assert.Equal(2, h2.ResumedAfterEpoch);
        Assert.Equal(StopKind.Completed, h2.Stop);
        TinySets.AssertSameWeights(straight, resumed);
        Assert.Equal(TinySets.Numbers(hs), TinySets.Numbers(h2));
        Assert.Equal(hs.BestEpoch, h2.BestEpoch);

        // Resuming a finished run changes nothing.
        var again = TinySets.Model(initSeed: 7);
        var h3 = Trainer.Fit(again, Train, Validation, options);
        TinySets.AssertSameWeights(straight, again);
        Assert.Equal(TinySets.Numbers(hs), TinySets.Numbers(h3));
    }

    [Fact]
    public void Checkpoints_are_written_as_resume_state_and_the_former_name_is_still_resumed()
    {
        var straight = TinySets.Model();
        var hs = Trainer.Fit(straight, Train, Validation, Options());

        var options = Options() with { CheckpointDirectory = _dir, Resume = true };
        using var cancel = new CancellationTokenSource();
        var stopper = new Progress(p => { if (p.Epoch == 3) cancel.Cancel(); });
        Trainer.Fit(TinySets.Model(), Train, Validation, options, stopper, cancel.Token);
        Assert.Equal(new[] { "resume-state.kit" }, Directory.GetFiles(_dir).Select(Path.GetFileName).ToArray());

        // A run interrupted under the former release left its checkpoint as last.kitckpt.
        string former = Path.Combine(_dir, "last.kitckpt");
        File.Move(Trainer.CheckpointPath(_dir), former);
        Assert.Equal(former, Trainer.ResumeCheckpoint(_dir));

        var resumed = TinySets.Model(initSeed: 99);
        var h2 = Trainer.Fit(resumed, Train, Validation, options);
        Assert.Equal(2, h2.ResumedAfterEpoch);
        TinySets.AssertSameWeights(straight, resumed);
        Assert.Equal(TinySets.Numbers(hs), TinySets.Numbers(h2));
        // Once saved under the current name, the former file is gone, so no stale state is read later.
        Assert.Equal(new[] { "resume-state.kit" }, Directory.GetFiles(_dir).Select(Path.GetFileName).ToArray());
    }

    [Fact]
    public void A_checkpoint_from_another_run_is_refused()
    {
        var options = Options(epochs: 1) with { CheckpointDirectory = _dir, Resume = true };
        Trainer.Fit(TinySets.Model(), Train, Validation, options);
        var e = Assert.Throws<BundleError>(() => Trainer.Fit(TinySets.Model(), Train, Validation, options with { LearningRate = 0.5 }));
        Assert.Contains("different run", e.Message);
        Assert.StartsWith(Trainer.CheckpointPath(_dir) + ":", e.Message);
    }

    [Fact]
    public void Early_stopping_picks_the_best_epoch_and_restores_its_weights()
    {
        // A tiny training set and a high rate overfit quickly, so validation loss turns up within a few epochs.
        var train = TinySets.Make(30, 21);
        var options = new TrainingOptions
        {
            Epochs = 40, BatchSize = 8, LearningRate = 0.05, Seed = 2, Monitor = MonitorMetric.ValidationLoss, Patience = 3,
        };
        var model = TinySets.Model();
        var h = Trainer.Fit(model, train, Validation, options);
        Assert.Equal(StopKind.EarlyStopped, h.Stop);
        var losses = h.Epochs.Select(e => e.ValidationLoss).ToList();
        int best = losses.IndexOf(losses.Min()) + 1;
        Assert.Equal(best, h.BestEpoch);
        Assert.Equal(h.BestEpoch + 3, h.Epochs.Count);
        Assert.True(h.Epochs.Count < 40);
        // The model holds the best epoch's weights, not the last epoch's.
        var now = Trainer.Validate(model, Validation, 64);
        Assert.Equal(h.Epochs[best - 1].ValidationLoss, now.Loss, 5);
        Assert.NotEqual(h.Epochs[^1].ValidationLoss, now.Loss, 5);
    }

    [Fact]
    public void Divergence_stops_before_the_bad_step_and_keeps_the_best_epoch()
    {
        var model = TinySets.Model();
        var before = TinySets.Weights(model);
        // Weights near float's maximum make the weighted loss overflow to infinity on the first batch.
        var options = new TrainingOptions { Epochs = 3, BatchSize = 32, ClassWeighting = ClassWeighting.Given, ClassWeights = new[] { 3e38, 3e38, 3e38 } };
        var h = Trainer.Fit(model, Train, Validation, options);
        Assert.Equal(StopKind.Diverged, h.Stop);
        Assert.Contains("diverged at epoch 1, batch 1", h.StopReason);
        Assert.Empty(h.Epochs);
        var after = TinySets.Weights(model);
        foreach (var (name, values) in before) Assert.Equal(values, after[name]);
    }

    [Fact]
    public void Cancellation_keeps_the_best_finished_epoch_and_its_checkpoint()
    {
        using var cancel = new CancellationTokenSource();
        var options = Options() with { CheckpointDirectory = _dir };
        var model = TinySets.Model();
        var h = Trainer.Fit(model, Train, Validation, options, new Progress(p => { if (p.Epoch == 2 && p.Batch == 3) cancel.Cancel(); }), cancel.Token);
        Assert.Equal(StopKind.Cancelled, h.Stop);
        Assert.Single(h.Epochs);
        Assert.Equal(1, h.BestEpoch);
        Assert.Equal(h.Epochs[0].ValidationLoss, Trainer.Validate(model, Validation, 64).Loss, 5);
        using var ck = TrainingCheckpoint.Load(TrainingCheckpoint.PathIn(_dir));
        Assert.Equal(1, ck.Epoch);
        Assert.False(ck.Finished);
    }

    [Fact]
    public void Progress_reports_every_n_batches_with_an_eta()
    {
        var ticks = new List<TrainingProgress>();
        Trainer.Fit(TinySets.Model(), Train, null, Options(epochs: 2) with { ProgressEvery = 3 }, new Progress(ticks.Add));
        int batches = ticks[0].Batches;
        int perEpoch = batches / 3 + (batches % 3 == 0 ? 0 : 1);
        Assert.Equal(2 * perEpoch, ticks.Count);
        Assert.All(ticks, t => Assert.True(t.Batch % 3 == 0 || t.Batch == t.Batches));
        Assert.True(ticks[^1].Eta < TimeSpan.FromMilliseconds(1));
        Assert.True(ticks[0].Eta > TimeSpan.Zero);
    }

    /// <summary>Runs the callback synchronously (System.Progress posts to the thread pool, which would race the loop).</summary>
    sealed class Progress(Action<TrainingProgress> action) : IProgress<TrainingProgress>
    {
        public void Report(TrainingProgress value) => action(value);
    }
}
