using Kit.Common;
using System.Diagnostics;
using Kit.Batching;
using Kit.Data;
using Kit.Models;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// The training loop. Per batch: forward, loss, backward, one read of (loss, global gradient norm) — a NaN or ∞ in
/// either stops the run before the bad step is applied — optional clipping, then the optimiser step at the
/// scheduled rate. Per epoch: a validation pass, the plateau schedule and early-stopping bookkeeping, a snapshot of
/// the best weights, and an atomic checkpoint. At the end the best epoch's weights are put back.
///
/// Determinism: batches come from (seed, epoch) and the engine's generator is reseeded from (seed, epoch) before
/// every epoch, so the same seed and data give the same weights bit for bit on the same machine with the same
/// thread count. Different intra-op thread counts may change reduction order inside the engine's kernels and so
/// the last bits; the thread count is therefore written next to the metrics (not into the fingerprint). The
/// engine generator is process-wide, so two runs training at the same time in one process are not reproducible.
/// </summary>
public static class Trainer
{
    public static TrainingHistory Fit(
        SequenceClassifier model,
        EncodedSet train,
        EncodedSet? validation,
        TrainingOptions options,
        IProgress<TrainingProgress>? progress = null,
        CancellationToken cancel = default)
    {
        options.Validate();
        Kit.Native.Engine.EnsureLoaded();
        EngineThreads.Apply(options.Threads);
        if (train.Count == 0) throw new ArgumentException("the training set is empty");
        if (validation is { Count: 0 }) validation = null;

        IBatchPlan plan = options.Bucketed
            ? new LengthBuckets(options.BatchSize, options.Seed)
            : new ShuffledBatches(options.BatchSize, options.Seed);
        long totalSteps = 0;
        for (int e = 1; e <= options.Epochs; e++) totalSteps += plan.Batches(train, e).Count();

        var named = model.named_parameters().Select(p => (p.name, (Tensor)p.parameter)).ToArray();
        var parameters = named.Select(p => p.Item2).ToArray();
        using var optimizer = ParameterOptimizer.Create(options, named);
        using var loss = TrainingLoss.For(options, train.Labels, model.Config.Classes);
        var schedule = new LearningRateSchedule(options.Schedule, options.LearningRate, totalSteps);
        var monitor = validation is null ? MonitorMetric.ValidationLoss : options.Monitor;
        bool higherIsBetter = validation is not null && ValidationScores.HigherIsBetter(monitor);

        var history = new TrainingHistory { Monitor = monitor };
        double bestScore = double.NaN;
        int epochsWithoutImprovement = 0, firstEpoch = 1;
        long globalStep = 0;
        Dictionary<string, Tensor>? bestWeights = null;
        string fingerprint = RunFingerprint.Of(model.Config, options, train, validation);
        string? checkpointPath = options.CheckpointDirectory is null ? null : TrainingCheckpoint.PathIn(options.CheckpointDirectory);
        // Possibly under the former file name; the next save writes the current name and removes the former file.
        string? resumeFrom = options.Resume && options.CheckpointDirectory is not null ? TrainingCheckpoint.FindIn(options.CheckpointDirectory) : null;
        bool finished = false;

        if (resumeFrom is not null)
        {
            using var ck = TrainingCheckpoint.Load(resumeFrom);
            if (ck.State.Fingerprint != fingerprint)
                throw new BundleError(resumeFrom, "the checkpoint belongs to a different run (model config, training options or data differ); delete it or train without resuming");
            TensorArchive.LoadInto(model, ck.Weights, resumeFrom);
            optimizer.LoadState(ck.State.OptimizerSteps, ck.OptimizerState);
            schedule.Load(ck.State.Schedule);
            bestWeights = ck.BestWeights is null ? null : Clone(ck.BestWeights);
            bestScore = ck.State.BestScore;
            history.BestEpoch = ck.State.BestEpoch;
            epochsWithoutImprovement = ck.State.EpochsWithoutImprovement;
            globalStep = ck.State.GlobalStep;
            history.Epochs.AddRange(ck.State.History);
            history.Stop = ck.State.Stop;
            history.StopReason = ck.State.StopReason;
            history.ResumedAfterEpoch = ck.State.Epoch;
            firstEpoch = ck.State.Epoch + 1;
            finished = ck.State.Finished;
        }

        var clock = Stopwatch.StartNew();
        int epochsThisProcess = options.Epochs - firstEpoch + 1;
        for (int epoch = firstEpoch; epoch <= options.Epochs && !finished; epoch++)
        {
            var epochClock = Stopwatch.StartNew();
            torch.manual_seed(EpochSeed(options.Seed, epoch));
            model.train();
            var batches = plan.Batches(train, epoch).ToList();
            double lossSum = 0, normSum = 0, rate = double.NaN;
            long seen = 0;
            int clipped = 0;
            using var correct = torch.zeros(1, ScalarType.Int64);
            bool interrupted = false;
            for (int b = 0; b < batches.Count; b++)
            {
                if (cancel.IsCancellationRequested)
                {
                    history.Stop = StopKind.Cancelled;
                    history.StopReason = $"cancelled during epoch {epoch}; that epoch was discarded and the best epoch so far kept";
                    interrupted = true;
                    break;
                }
                using var scope = torch.NewDisposeScope();
                using var batch = BatchBuilder.Build(train, batches[b]);
                optimizer.ZeroGrad();
                var logits = model.forward(batch.Tokens, batch.Lengths);
                var objective = loss.Compute(logits, batch.Labels);
                objective.backward();
                var check = torch.stack(new[] { objective.detach().to(ScalarType.Float32).reshape(1), GradientNorm.TotalTensor(parameters).reshape(1) })
                    .data<float>().ToArray();
                double l = check[0], norm = check[1];
                if (!double.IsFinite(l) || !double.IsFinite(norm))
                {
                    history.Stop = StopKind.Diverged;
                    history.StopReason = $"training diverged at epoch {epoch}, batch {b + 1}: " +
                        (!double.IsFinite(l) ? $"loss is {l}" : $"gradient norm is {norm}") +
                        "; the step was not applied and the best epoch so far was kept (try a lower learning rate or gradient clipping)";
                    interrupted = true;
                    break;
                }
                if (options.MaxGradientNorm is double max && norm > max)
                {
                    GradientNorm.Scale(parameters, max / (norm + 1e-6));
                    clipped++;
                }
                rate = schedule.Rate(globalStep, epoch);
                optimizer.Step(rate);
                globalStep++;
                lossSum += l * batch.Size;
                normSum += norm;
                correct.add_(logits.argmax(1).eq(batch.Labels).sum());
                seen += batch.Size;
                if (progress is not null && ((b + 1) % options.ProgressEvery == 0 || b + 1 == batches.Count))
                {
                    double doneFraction = ((epoch - firstEpoch) + (b + 1) / (double)batches.Count) / epochsThisProcess;
                    var eta = TimeSpan.FromSeconds(clock.Elapsed.TotalSeconds * (1 - doneFraction) / Math.Max(doneFraction, 1e-9));
                    progress.Report(new TrainingProgress(epoch, options.Epochs, b + 1, batches.Count, lossSum / seen,
                        history.Epochs.Count > 0 && validation is not null ? history.Epochs[^1].ValidationAccuracy : null, eta, rate));
                }
            }
            if (interrupted) break;

            var scores = validation is null ? null : Validate(model, validation, options.BatchSize);
            double seconds = epochClock.Elapsed.TotalSeconds;
            double trainLoss = lossSum / seen;
            history.Epochs.Add(new EpochRecord(epoch, trainLoss, correct.item<long>() / (double)seen,
                scores?.Loss ?? double.NaN, scores?.Accuracy ?? double.NaN, rate, seconds, seen / Math.Max(seconds, 1e-9),
                scores?.MacroF1 ?? double.NaN, normSum / batches.Count, clipped));

            double score = scores?.Get(monitor) ?? trainLoss;
            schedule.EndOfEpoch(score, higherIsBetter, options.MinImprovement);
            if (double.IsNaN(bestScore) || LearningRateSchedule.Improves(score, bestScore, higherIsBetter, options.MinImprovement))
            {
                bestScore = score;
                history.BestEpoch = epoch;
                epochsWithoutImprovement = 0;
                DisposeAll(bestWeights);
                bestWeights = Snapshot(model);
            }
            else if (++epochsWithoutImprovement >= (options.Patience ?? int.MaxValue))
            {
                history.Stop = StopKind.EarlyStopped;
                history.StopReason = $"early stop after epoch {epoch}: {monitor} did not improve for {epochsWithoutImprovement} epoch(s); best epoch {history.BestEpoch}";
                finished = true;
            }
            if (epoch == options.Epochs) finished = true;
            if (checkpointPath is not null)
            {
                using var ck = new TrainingCheckpoint
                {
                    State = new CheckpointState(fingerprint, epoch, globalStep, optimizer.Steps, schedule.Save(), bestScore, history.BestEpoch,
                        epochsWithoutImprovement, finished, history.Stop, history.StopReason, history.Epochs.ToList()),
                    Weights = Snapshot(model),
                    BestWeights = bestWeights is null ? null : Clone(bestWeights),
                    OptimizerState = Clone(optimizer.StateTensors),
                };
                ck.Save(checkpointPath);
                if (resumeFrom is not null && resumeFrom != checkpointPath) File.Delete(resumeFrom);
            }
        }

        if (bestWeights is not null)
        {
            Restore(model, bestWeights);
            DisposeAll(bestWeights);
        }
        model.eval();
        return history;
    }

    /// <summary>Where <see cref="Fit"/> keeps the per-epoch checkpoint inside a checkpoint directory.</summary>
    public static string CheckpointPath(string checkpointDirectory) => TrainingCheckpoint.PathIn(checkpointDirectory);

    /// <summary>The checkpoint a resume would continue from (current or former file name), or null when there is none.</summary>
    public static string? ResumeCheckpoint(string checkpointDirectory) => TrainingCheckpoint.FindIn(checkpointDirectory);

    /// <summary>Mean cross-entropy and accuracy over a set, in evaluation mode, without gradients.</summary>
    public static (double Loss, double Accuracy) Evaluate(SequenceClassifier model, EncodedSet set, int batchSize = 256)
    {
        var s = Validate(model, set, batchSize);
        return (s.Loss, s.Accuracy);
    }

    /// <summary>Plain mean cross-entropy, accuracy and macro F1 over a set, in evaluation mode, without gradients.</summary>
    public static ValidationScores Validate(SequenceClassifier model, EncodedSet set, int batchSize = 256)
    {
        model.eval();
        using var noGrad = torch.no_grad();
        int classes = model.Config.Classes;
        double lossSum = 0;
        long correct = 0;
        long[] tp = new long[classes], predicted = new long[classes], actual = new long[classes];
        foreach (var rows in new InOrderBatches(batchSize).Batches(set, 0))
        {
            using var scope = torch.NewDisposeScope();
            using var batch = BatchBuilder.Build(set, rows);
            var logits = model.forward(batch.Tokens, batch.Lengths);
            lossSum += nn.functional.cross_entropy(logits, batch.Labels, reduction: nn.Reduction.Sum).item<float>();
            var guess = logits.argmax(1).data<long>().ToArray();
            for (int i = 0; i < rows.Length; i++)
            {
                int y = set.Labels[rows[i]], p = (int)guess[i];
                actual[y]++;
                predicted[p]++;
                if (p == y) { tp[y]++; correct++; }
            }
        }
        int n = Math.Max(set.Count, 1);
        return new ValidationScores(lossSum / n, correct / (double)n, ValidationScores.MacroF1From(tp, predicted, actual));
    }

    /// <summary>The engine seed for one epoch, mixed from the run seed so neighbouring epochs are unrelated.</summary>
    internal static long EpochSeed(ulong seed, int epoch) => (long)(SplitMix64.ForEpoch(seed ^ 0x5EED_0F_7124_1A11UL, epoch).Next() & 0x7FFF_FFFF_FFFF_FFFF);

    static Dictionary<string, Tensor> Snapshot(SequenceClassifier model)
    {
        using var noGrad = torch.no_grad();
        return Clone(model.state_dict());
    }

    static Dictionary<string, Tensor> Clone(IEnumerable<KeyValuePair<string, Tensor>> tensors)
    {
        using var noGrad = torch.no_grad();
        return tensors.ToDictionary(kv => kv.Key, kv => kv.Value.detach().clone().DetachFromDisposeScope(), StringComparer.Ordinal);
    }

    static void Restore(SequenceClassifier model, Dictionary<string, Tensor> weights)
    {
        using var noGrad = torch.no_grad();
        foreach (var (name, value) in model.state_dict())
            value.copy_(weights[name]);
    }

    static void DisposeAll(Dictionary<string, Tensor>? weights)
    {
        if (weights is null) return;
        foreach (var t in weights.Values) t.Dispose();
    }
}
