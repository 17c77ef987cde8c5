using Kit.Data;

namespace Kit.Batching;

/// <summary>
/// Decides which rows go together in each batch of one epoch. Every row of the set appears in exactly one
/// batch per epoch (nothing is dropped); the same seed and epoch give the same batches.
/// </summary>
public interface IBatchPlan
{
    IEnumerable<int[]> Batches(EncodedSet set, int epoch);
}
