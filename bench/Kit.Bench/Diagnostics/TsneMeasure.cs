using System.Diagnostics;
using Kit.Diagnostics;

namespace Kit.Bench.Diagnostics;

/// <summary>
/// Wall time of a full Barnes–Hut t-SNE run (affinities, 1,000 iterations) on 10,000 × 64 points, and the
/// process CPU time of the same run: on a shared machine the wall time mostly measures the neighbours' load,
/// while CPU time / cores bounds what an idle machine of this size would take.
/// </summary>
public sealed class TsneMeasure : IMeasure
{
    public IReadOnlyList<string> Ids => ["tsne-10k-seconds", "tsne-10k-cpu-seconds"];

    public IEnumerable<Figure> Run()
    {
        var x = BenchData.Clusters(10_000, 64, seed: 1);
        var (seconds, cpu) = CpuClock.Time(() =>
        {
            var y = Tsne.Run(x, new TsneOptions());
            if (y.Length != x.Length) throw new InvalidOperationException("t-SNE returned the wrong number of points.");
        });
        string how = $"Tsne.Run, 10,000 × 64 seeded Gaussian clusters, perplexity 30, θ 0.5, 1,000 iterations, {Environment.ProcessorCount} cores, one run, load average {CpuClock.LoadAverage()} at the end";
        yield return new Figure("tsne-10k-seconds", seconds, "s", "≤ 60 s on 2 cores", how);
        yield return new Figure("tsne-10k-cpu-seconds", cpu, "s", "≤ 120 s (60 s × 2 cores)", "process CPU time of the same run; " + how);
    }
}
