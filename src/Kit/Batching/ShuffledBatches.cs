using Kit.Common;
using Kit.Data;

namespace Kit.Batching;

/// <summary>A fresh seeded permutation each epoch, cut every <c>batchSize</c> rows; lengths are ignored.</summary>
public sealed class ShuffledBatches : IBatchPlan
{
    public int BatchSize { get; }
    public ulong Seed { get; }

    public ShuffledBatches(int batchSize, ulong seed)
    {
        if (batchSize <= 0) throw new ArgumentOutOfRangeException(nameof(batchSize), batchSize, "batch size must be positive");
        BatchSize = batchSize;
        Seed = seed;
    }

    public IEnumerable<int[]> Batches(EncodedSet set, int epoch)
    {
        var order = new int[set.Count];
        for (int i = 0; i < order.Length; i++) order[i] = i;
        SplitMix64.ForEpoch(Seed, epoch).Shuffle(order.AsSpan());
        for (int start = 0; start < order.Length; start += BatchSize)
            yield return order[start..Math.Min(order.Length, start + BatchSize)];
    }
}
