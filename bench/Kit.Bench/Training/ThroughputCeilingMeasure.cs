using System.Diagnostics;
using Kit.Models;
using Kit.Training;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Bench.Training;

/// <summary>
/// matmul-ceiling: fp32 2048×2048 · 2048×2048 product, 2·2048³ FLOPs per call, median of several calls.
/// gflops-h256: one training epoch of a GRU with hidden 256 (embedding 32, batch 256, length 12) through
/// Trainer.Fit, counting only the cell's multiply-adds: 3 gates × H × (E + H) per step and row forward, and
/// three times that for forward + backward (input gradients and weight gradients are each a product of the same
/// size), at 2 FLOPs per multiply-add. Goal: at least 25 % of the ceiling measured in the same run.
/// </summary>
public sealed class ThroughputCeilingMeasure : IMeasure
{
    const int N = 2048, Embed = 32, Hidden = 256, Length = 12, Batch = 256;

    public IReadOnlyList<string> Ids { get; } = new[] { "matmul-ceiling", "gflops-h256" };

    public IEnumerable<Figure> Run()
    {
        Kit.Native.Engine.EnsureLoaded();
        EngineThreads.Apply(0);
        int threads = torch.get_num_threads();
        torch.manual_seed(2);
        double ceiling;
        using (var a = torch.randn(N, N))
        using (var b = torch.randn(N, N))
        {
            torch.matmul(a, b).Dispose();
            var times = new List<double>();
            for (int r = 0; r < 7; r++)
            {
                var clock = Stopwatch.StartNew();
                using var c = torch.matmul(a, b);
                c.sum().item<float>();
                times.Add(clock.Elapsed.TotalSeconds);
            }
            ceiling = 2.0 * N * N * (double)N / TrainingBenchData.Median(times) / 1e9;
        }
        yield return new Figure("matmul-ceiling", ceiling, "GFLOP/s", "reference",
            $"fp32 {N}³ matmul, median of 7 calls, {threads} threads");

        var set = TrainingBenchData.Make(Batch * 8, Length, 5);
        var config = new ClassifierConfig(TrainingBenchData.Vocabulary, TrainingBenchData.Classes, CellKind.Gru, Embed, Hidden);
        var options = new TrainingOptions { Epochs = 1, BatchSize = Batch, Bucketed = false, Seed = 5 };
        double flopsPerEpoch = 3 * 2 * 3.0 * Hidden * (Embed + Hidden) * Length * set.Count;
        var rates = new List<double>();
        for (int r = 0; r < 4; r++)
        {
            torch.manual_seed(1);
            using var model = config.Build();
            var clock = Stopwatch.StartNew();
            Trainer.Fit(model, set, null, options);
            if (r > 0) rates.Add(flopsPerEpoch / clock.Elapsed.TotalSeconds / 1e9);
        }
        double achieved = TrainingBenchData.Median(rates);
        yield return new Figure("gflops-h256", achieved, "GFLOP/s", "≥ 25 % of matmul-ceiling",
            $"{achieved / ceiling:P0} of the {ceiling:F1} GFLOP/s ceiling; median of 3 one-epoch Trainer.Fit runs after a warm-up, " +
            $"{set.Count} rows, batch {Batch}, length {Length}, GRU E={Embed} H={Hidden}, cell multiply-adds only, {threads} threads");
    }
}
