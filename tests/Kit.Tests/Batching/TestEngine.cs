using Kit.Data;

namespace Kit.Tests.Batching;

/// <summary>Loads the engine once for every test that touches TorchSharp, and builds small sets.</summary>
internal static class TestEngine
{
    public static void Load() => Kit.Native.Engine.EnsureLoaded();

    /// <summary>A set of random sequences with the given lengths, ids in 2..vocab-1 (0 pad, 1 unknown reserved).</summary>
    public static EncodedSet RandomSet(IReadOnlyList<int> lengths, int vocab, int classes, int seed)
    {
        var random = new Random(seed);
        var sequences = lengths.Select(l => Enumerable.Range(0, l).Select(_ => random.Next(2, vocab)).ToArray()).ToList();
        var labels = lengths.Select(_ => random.Next(classes)).ToList();
        return EncodedSet.FromSequences(sequences, labels);
    }
}
