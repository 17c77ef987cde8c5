using Kit.Data;

namespace Kit.Batching;

/// <summary>Rows in set order, cut every <c>batchSize</c> rows: for evaluation, where order must be stable.</summary>
public sealed class InOrderBatches : IBatchPlan
{
    public int BatchSize { get; }

    public InOrderBatches(int batchSize)
    {
        if (batchSize <= 0) throw new ArgumentOutOfRangeException(nameof(batchSize), batchSize, "batch size must be positive");
        BatchSize = batchSize;
    }

    public IEnumerable<int[]> Batches(EncodedSet set, int epoch)
    {
        for (int start = 0; start < set.Count; start += BatchSize)
        {
            int n = Math.Min(BatchSize, set.Count - start);
            var batch = new int[n];
            for (int k = 0; k < n; k++) batch[k] = start + k;
            yield return batch;
        }
    }
}
