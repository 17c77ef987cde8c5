using System.Diagnostics;
using Kit.Batching;
using Kit.Data;
using Kit.Models;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// The training loop: Adam on cross-entropy, one validation pass per epoch, the best validation epoch's
/// weights restored at the end. Every batch runs inside a dispose scope so memory stays flat across epochs.
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
        Kit.Native.Engine.EnsureLoaded();
        EngineThreads.Apply(options.Threads);
        torch.manual_seed((long)(options.Seed & 0x7FFF_FFFF_FFFF_FFFF));

        IBatchSampler sampler = options.Bucketed
            ? new BucketBatchSampler(options.BatchSize, options.Seed)
            : new RandomBatchSampler(options.BatchSize, options.Seed);
        using var optimizer = optim.Adam(model.parameters(), options.LearningRate);
        var history = new TrainingHistory();
        double bestValidation = double.NegativeInfinity;
        Dictionary<string, Tensor>? bestWeights = null;
        var clock = Stopwatch.StartNew();

        for (int epoch = 1; epoch <= options.Epochs; epoch++)
        {
            cancel.ThrowIfCancellationRequested();
            var epochClock = Stopwatch.StartNew();
            model.train();
            var batches = sampler.Batches(train, epoch).ToList();
            double lossSum = 0;
            long correct = 0, seen = 0;
            for (int b = 0; b < batches.Count; b++)
            {
                if (cancel.IsCancellationRequested) break;
                using var scope = torch.NewDisposeScope();
                using var batch = BatchBuilder.Build(train, batches[b]);
                optimizer.zero_grad();
                var logits = model.forward(batch.Tokens, batch.Lengths);
                var loss = nn.functional.cross_entropy(logits, batch.Labels);
                loss.backward();
                optimizer.step();
                double l = loss.item<float>();
                if (!double.IsFinite(l))
                {
                    history.StopReason = $"loss became {l} at epoch {epoch}, batch {b + 1}; stopped and kept the best epoch so far";
                    goto done;
                }
                lossSum += l * batch.Size;
                correct += logits.argmax(1).eq(batch.Labels).sum().item<long>();
                seen += batch.Size;
                if (progress is not null && ((b + 1) % options.ProgressEvery == 0 || b + 1 == batches.Count))
                {
                    double doneFraction = ((epoch - 1) + (b + 1) / (double)batches.Count) / options.Epochs;
                    var eta = TimeSpan.FromSeconds(clock.Elapsed.TotalSeconds * (1 - doneFraction) / Math.Max(doneFraction, 1e-9));
                    progress.Report(new TrainingProgress(epoch, options.Epochs, b + 1, batches.Count, lossSum / seen,
                        history.Epochs.Count > 0 ? history.Epochs[^1].ValidationAccuracy : null, eta));
                }
            }
            cancel.ThrowIfCancellationRequested();

            var (valLoss, valAcc) = validation is null ? (double.NaN, double.NaN) : Evaluate(model, validation, options.BatchSize);
            double seconds = epochClock.Elapsed.TotalSeconds;
            history.Epochs.Add(new EpochRecord(epoch, lossSum / Math.Max(seen, 1), correct / (double)Math.Max(seen, 1),
                valLoss, valAcc, options.LearningRate, seconds, seen / Math.Max(seconds, 1e-9)));

            double score = validation is null ? -lossSum / Math.Max(seen, 1) : valAcc;
            if (score > bestValidation)
            {
                bestValidation = score;
                history.BestEpoch = epoch;
                DisposeAll(bestWeights);
                bestWeights = Snapshot(model);
            }
        }
    done:
        if (bestWeights is not null)
        {
            Restore(model, bestWeights);
            DisposeAll(bestWeights);
        }
        model.eval();
        return history;
    }

    /// <summary>Mean cross-entropy and accuracy over a set, in evaluation mode, without gradients.</summary>
    public static (double Loss, double Accuracy) Evaluate(SequenceClassifier model, EncodedSet set, int batchSize = 256)
    {
        model.eval();
        using var noGrad = torch.no_grad();
        double lossSum = 0;
        long correct = 0;
        foreach (var rows in new SequentialBatchSampler(batchSize).Batches(set, 0))
        {
            using var scope = torch.NewDisposeScope();
            using var batch = BatchBuilder.Build(set, rows);
            var logits = model.forward(batch.Tokens, batch.Lengths);
            lossSum += nn.functional.cross_entropy(logits, batch.Labels, reduction: nn.Reduction.Sum).item<float>();
            correct += logits.argmax(1).eq(batch.Labels).sum().item<long>();
        }
        return (lossSum / Math.Max(set.Count, 1), correct / (double)Math.Max(set.Count, 1));
    }

    static Dictionary<string, Tensor> Snapshot(SequenceClassifier model)
    {
        using var noGrad = torch.no_grad();
        return model.state_dict().ToDictionary(kv => kv.Key, kv => kv.Value.detach().clone().MoveToOuterDisposeScope());
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
