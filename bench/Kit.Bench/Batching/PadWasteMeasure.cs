using Kit.Batching;

namespace Kit.Bench.Batching;

/// <summary>Share of pad positions in an epoch of batches over the demo hostnames: random batches vs length buckets.</summary>
public sealed class PadWasteMeasure : IMeasure
{
    const int BatchSize = 64;
    const int Epochs = 5;

    public IReadOnlyList<string> Ids { get; } = new[] { "pad-waste-naive", "pad-waste-bucketed" };

    public IEnumerable<Figure> Run()
    {
        var set = DemoHostnames.Load();
        double naive = 0, bucketed = 0;
        for (int epoch = 0; epoch < Epochs; epoch++)
        {
            naive += PadWaste.Measure(set, new ShuffledBatches(BatchSize, 1), epoch) / Epochs;
            bucketed += PadWaste.Measure(set, new LengthBuckets(BatchSize, 1), epoch) / Epochs;
        }
        string how = $"demo hostnames ({set.Count} rows, characters), batch size {BatchSize}, each batch padded to its longest row; " +
                     $"pad positions / all positions, mean of {Epochs} epochs";
        yield return new Figure("pad-waste-naive", 100 * naive, "%", "reference", "random batches; " + how);
        yield return new Figure("pad-waste-bucketed", 100 * bucketed, "%", "≤ 5 %", "automatic length buckets; " + how);
    }
}
