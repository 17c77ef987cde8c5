using System.Diagnostics;
using Kit.Batching;
using Kit.Data;
using Kit.Models;
using Kit.Training;
using TorchSharp;

namespace Kit.Bench.Training;

/// <summary>
/// seq/s of the convolutional and Transformer encoders against the GRU at the demo's lengths: all 19,840 demo
/// hostnames (characters, 2–40 long), each encoder at the kit's default sizes (embedding 32, hidden 64; four kernel
/// widths 2–5 for the CNN; 4 heads, one block for the Transformer), through the kit's own loops — one training epoch
/// (Trainer.Fit, length-bucketed batches of 64) and one scoring pass (Scoring.Logits, batches of 512). Encoders
/// alternate within each round (GRU, CNN, Transformer, GRU, …); each side's median of the rounds is taken and the
/// figures are ratios to the GRU of the same rounds.
/// </summary>
public sealed class EncoderThroughputMeasure : IMeasure
{
    const int Rounds = 3, Batch = 64, ScoreBatch = 512;
    const ulong Seed = 5;

    public IReadOnlyList<string> Ids { get; } = new[]
    {
        "cnn-vs-gru-train", "transformer-vs-gru-train", "cnn-vs-gru-score", "transformer-vs-gru-score", "gru-train-seq-per-s",
    };

    public IEnumerable<Figure> Run()
    {
        Kit.Native.Engine.EnsureLoaded();
        EngineThreads.Apply(0);
        int threads = torch.get_num_threads();
        var set = Batching.DemoHostnames.Load();
        var encoders = new (string Name, ClassifierConfig Config)[]
        {
            ("GRU", new ClassifierConfig(Batching.DemoHostnames.VocabularySize, Batching.DemoHostnames.Classes)),
            ("CNN", new ClassifierConfig(Batching.DemoHostnames.VocabularySize, Batching.DemoHostnames.Classes, Encoder: EncoderKind.Convolution, Pooling: PoolingKind.Max)),
            ("Transformer", new ClassifierConfig(Batching.DemoHostnames.VocabularySize, Batching.DemoHostnames.Classes, Encoder: EncoderKind.Transformer, Pooling: PoolingKind.Mean)),
        };
        var options = new TrainingOptions { Epochs = 1, BatchSize = Batch, Seed = Seed, LearningRate = 1e-3 };
        var train = encoders.ToDictionary(e => e.Name, _ => new List<double>());
        var score = encoders.ToDictionary(e => e.Name, _ => new List<double>());
        foreach (var (_, config) in encoders) Once(config, set, options);   // warm-up: kernels, pools
        for (int r = 0; r < Rounds; r++)
            foreach (var (name, config) in encoders)
            {
                var (t, s) = Once(config, set, options);
                train[name].Add(t);
                score[name].Add(s);
            }
        double Median(Dictionary<string, List<double>> d, string name) => TrainingBenchData.Median(d[name]);
        double gruTrain = Median(train, "GRU"), gruScore = Median(score, "GRU");
        string how = $"median of {Rounds} rounds, encoders alternating, {set.Count} demo hostnames (characters, lengths {set.Lengths().Min()}–{set.Lengths().Max()}), {threads} threads; ";
        foreach (var name in new[] { "CNN", "Transformer" })
        {
            string id = name.ToLowerInvariant();
            yield return new Figure($"{id}-vs-gru-train", Median(train, name) / gruTrain, "×", "orientation",
                how + $"one Trainer.Fit epoch, batches of {Batch}: {name} {Median(train, name):F0} seq/s vs GRU {gruTrain:F0} seq/s");
            yield return new Figure($"{id}-vs-gru-score", Median(score, name) / gruScore, "×", "orientation",
                how + $"Scoring.Logits, batches of {ScoreBatch}: {name} {Median(score, name):F0} seq/s vs GRU {gruScore:F0} seq/s");
        }
        yield return new Figure("gru-train-seq-per-s", gruTrain, "seq/s", "reference", how + "the GRU's training rate the ratios above divide by");
    }

    static (double Train, double Score) Once(ClassifierConfig config, EncodedSet set, TrainingOptions options)
    {
        torch.manual_seed(1);
        using var model = config.Build();
        var clock = Stopwatch.StartNew();
        Trainer.Fit(model, set, null, options);
        double train = set.Count / clock.Elapsed.TotalSeconds;
        clock.Restart();
        Kit.Training.Scoring.Logits(model, set, ScoreBatch);
        double score = set.Count / clock.Elapsed.TotalSeconds;
        return (train, score);
    }
}
