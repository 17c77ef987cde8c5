using System.Diagnostics;
using Kit.Batching;
using Kit.Data;
using Kit.Models;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Bench.Batching;

/// <summary>
/// One training epoch (forward, backward, Adam step) over the demo hostnames, same architecture and same starting
/// weights: random batches run padded versus length-bucketed batches run packed. Rounds alternate so both see
/// the same machine load; the figure is the ratio of the summed times. Every 8th row of the demo set is used
/// (same length spread, an eighth of the time) and the engine runs on one thread, so that a busy shared
/// machine slows both sides alike instead of favouring whichever happens to get the cores.
/// </summary>
public sealed class EpochSpeedupMeasure : IMeasure
{
    const int BatchSize = 64;
    const int Rounds = 3;
    const int Stride = 8;

    public IReadOnlyList<string> Ids { get; } = new[] { "epoch-speedup-bucketed" };

    public IEnumerable<Figure> Run()
    {
        Kit.Native.Engine.EnsureLoaded();
        var full = DemoHostnames.Load();
        var set = full.Subset(Enumerable.Range(0, full.Count).Where(i => i % Stride == 0).ToArray());
        int threads = torch.get_num_threads();
        torch.set_num_threads(1);
        try
        {
            return Measure(set).ToList();
        }
        finally
        {
            torch.set_num_threads(threads);
        }
    }

    static IEnumerable<Figure> Measure(EncodedSet set)
    {
        var config = new ClassifierConfig(DemoHostnames.VocabularySize, DemoHostnames.Classes, CellKind.Gru, EmbeddingSize: 32, HiddenSize: 64);
        torch.manual_seed(1);
        var naiveModel = (config with { Packed = false }).Build();
        var bucketedModel = config.Build();
        using (torch.no_grad())
            foreach (var (name, value) in bucketedModel.state_dict())
                value.copy_(naiveModel.state_dict()[name]);

        IBatchPlan naive = new ShuffledBatches(BatchSize, 7), bucketed = new LengthBuckets(BatchSize, 7);
        // Warm-up: first calls pay for native allocation and kernel selection.
        Epoch(naiveModel, set, naive, 0, maxBatches: 5);
        Epoch(bucketedModel, set, bucketed, 0, maxBatches: 5);
        double naiveSeconds = 0, bucketedSeconds = 0;
        for (int round = 1; round <= Rounds; round++)
        {
            naiveSeconds += Epoch(naiveModel, set, naive, round);
            bucketedSeconds += Epoch(bucketedModel, set, bucketed, round);
        }
        yield return new Figure("epoch-speedup-bucketed", naiveSeconds / bucketedSeconds, "×", "≥ 1.5×",
            $"GRU E32 H64, batch size {BatchSize}, every {Stride}th demo hostname ({set.Count} rows), one engine thread; {Rounds} alternating epochs each: " +
            $"random padded {naiveSeconds / Rounds:F1} s/epoch vs bucketed packed {bucketedSeconds / Rounds:F1} s/epoch");
    }

    static double Epoch(SequenceClassifier model, EncodedSet set, IBatchPlan plan, int epoch, int maxBatches = int.MaxValue)
    {
        model.train();
        using var optimizer = optim.Adam(model.parameters(), 1e-3);
        var clock = Stopwatch.StartNew();
        foreach (var rows in plan.Batches(set, epoch).Take(maxBatches))
        {
            using var scope = torch.NewDisposeScope();
            using var batch = BatchBuilder.Build(set, rows);
            optimizer.zero_grad();
            var loss = nn.functional.cross_entropy(model.forward(batch.Tokens, batch.Lengths), batch.Labels);
            loss.backward();
            optimizer.step();
        }
        return clock.Elapsed.TotalSeconds;
    }
}
