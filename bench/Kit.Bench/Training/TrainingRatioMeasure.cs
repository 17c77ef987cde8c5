using System.Diagnostics;
using Kit.Batching;
using Kit.Models;
using Kit.Training;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Bench.Training;

/// <summary>
/// train-ratio and infer-ratio: the kit's training loop (Trainer.Fit, one epoch) and batch scoring (Scoring.Logits)
/// against a bare TorchSharp loop driving the same model (the kit's SequenceClassifier with the same config and
/// initial weights), the same row batches and the same thread count, so the ratio prices the loop itself: batch
/// building, the divergence check, the kit optimiser, bookkeeping. GRU, embedding 32, hidden 64, length 12; batch
/// 256 for training, 4096 for scoring; train-ratio-dropout repeats the training comparison with dropout on. Rounds alternate kit and bare (A B A B …); each side's median is taken.
/// </summary>
public sealed class TrainingRatioMeasure : IMeasure
{
    const int Embed = 32, Hidden = 64, Length = 12, TrainBatch = 256, InferBatch = 4096, Rounds = 9;
    const ulong Seed = 9;

    public IReadOnlyList<string> Ids { get; } = new[] { "train-ratio", "train-ratio-dropout", "infer-ratio" };

    /// <summary>The dropout rate of train-ratio-dropout, on embeddings and before the head (one layer, so none between layers).</summary>
    const double Dropout = 0.3;

    public IEnumerable<Figure> Run()
    {
        Kit.Native.Engine.EnsureLoaded();
        EngineThreads.Apply(0);
        int threads = torch.get_num_threads();
        var trainSet = TrainingBenchData.Make(TrainBatch * 12, Length, Seed);
        var inferSet = TrainingBenchData.Make(InferBatch * 4, Length, Seed + 1);
        var config = new ClassifierConfig(TrainingBenchData.Vocabulary, TrainingBenchData.Classes, CellKind.Gru, Embed, Hidden);
        var options = new TrainingOptions { Epochs = 1, BatchSize = TrainBatch, Bucketed = false, Seed = Seed, LearningRate = 1e-3 };
        var batches = new ShuffledBatches(TrainBatch, Seed).Batches(trainSet, 1).ToList();

        // Warm-up both paths once (first calls load kernels and allocate pools).
        KitTrain(config, trainSet, options);
        BareTrain(config, trainSet, batches);
        // Rounds alternate kit and bare; each side's median is taken.
        (double Kit, double Bare) Interleaved(ClassifierConfig c)
        {
            var kit = new List<double>();
            var bare = new List<double>();
            for (int r = 0; r < Rounds; r++)
            {
                kit.Add(KitTrain(c, trainSet, options));
                bare.Add(BareTrain(c, trainSet, batches));
            }
            return (TrainingBenchData.Median(kit), TrainingBenchData.Median(bare));
        }
        var (kt, bt) = Interleaved(config);
        yield return new Figure("train-ratio", kt / bt, "×", "≥ 0.95",
            $"median of {Rounds} interleaved one-epoch runs ({trainSet.Count} rows, {batches.Count} batches of {TrainBatch}, {threads} threads): " +
            $"kit {kt:F0} seq/s (Trainer.Fit: packed GRU, kit Adam, loss + gradient-norm check per batch) vs bare TorchSharp {bt:F0} seq/s (same model, plain tensors, optim.Adam, cross_entropy, loss read back)");

        // The same comparison with dropout on: both sides drive the same model, so both pay for the same masks.
        var (kd, bd) = Interleaved(config with { EmbeddingDropout = Dropout, HeadDropout = Dropout });
        yield return new Figure("train-ratio-dropout", kd / bd, "×", "≥ 0.95",
            $"as train-ratio with dropout {Dropout} on the embeddings and before the head (training mode, both sides the same model): " +
            $"median of {Rounds} interleaved one-epoch runs, kit {kd:F0} seq/s vs bare TorchSharp {bd:F0} seq/s");

        torch.manual_seed(1);
        var kitModel = config.Build();
        Kit.Training.Scoring.Logits(kitModel, inferSet, InferBatch);
        BareInfer(kitModel, inferSet);
        var kitInfer = new List<double>();
        var bareInfer = new List<double>();
        for (int r = 0; r < Rounds; r++)
        {
            var clock = Stopwatch.StartNew();
            Kit.Training.Scoring.Logits(kitModel, inferSet, InferBatch);
            kitInfer.Add(inferSet.Count / clock.Elapsed.TotalSeconds);
            bareInfer.Add(BareInfer(kitModel, inferSet));
        }
        double ki = TrainingBenchData.Median(kitInfer), bi = TrainingBenchData.Median(bareInfer);
        yield return new Figure("infer-ratio", ki / bi, "×", "≥ 0.95",
            $"median of {Rounds} interleaved passes over {inferSet.Count} rows in batches of {InferBatch} ({threads} threads): " +
            $"kit {ki:F0} seq/s (Scoring.Logits, logits read back as double[][]) vs bare TorchSharp {bi:F0} seq/s (same model, no_grad forward on plain tensors, logits read back as float[])");
    }

    static double KitTrain(ClassifierConfig config, Kit.Data.EncodedSet set, TrainingOptions options)
    {
        torch.manual_seed(1);
        var model = config.Build();
        var clock = Stopwatch.StartNew();
        Trainer.Fit(model, set, null, options);
        double rate = set.Count / clock.Elapsed.TotalSeconds;
        model.Dispose();
        return rate;
    }

    static double BareTrain(ClassifierConfig config, Kit.Data.EncodedSet set, List<int[]> batches)
    {
        torch.manual_seed(1);
        var model = config.Build();
        var optimizer = optim.Adam(model.parameters(), 1e-3);
        var clock = Stopwatch.StartNew();
        model.train();
        foreach (var rows in batches)
        {
            using var scope = torch.NewDisposeScope();
            var (tokens, labels) = TrainingBenchData.Tensors(set, rows, Length);
            optimizer.zero_grad();
            var loss = nn.functional.cross_entropy(model.call(tokens, FullLengths(rows.Length)), labels);
            loss.backward();
            optimizer.step();
            loss.item<float>();
        }
        double rate = set.Count / clock.Elapsed.TotalSeconds;
        model.Dispose();
        return rate;
    }

    static Tensor FullLengths(int rows) => torch.full(rows, Length, ScalarType.Int64);

    static double BareInfer(SequenceClassifier model, Kit.Data.EncodedSet set)
    {
        model.eval();
        using var noGrad = torch.no_grad();
        var clock = Stopwatch.StartNew();
        for (int start = 0; start < set.Count; start += InferBatch)
        {
            using var scope = torch.NewDisposeScope();
            var rows = Enumerable.Range(start, Math.Min(InferBatch, set.Count - start)).ToArray();
            var (tokens, _) = TrainingBenchData.Tensors(set, rows, Length);
            model.call(tokens, FullLengths(rows.Length)).data<float>().ToArray();
        }
        return set.Count / clock.Elapsed.TotalSeconds;
    }
}
