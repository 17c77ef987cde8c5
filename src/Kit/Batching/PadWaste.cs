using Kit.Data;

namespace Kit.Batching;

/// <summary>Pad positions over all positions of one epoch's batches, each padded to its own longest row.</summary>
public static class PadWaste
{
    public static double Measure(EncodedSet set, IBatchPlan plan, int epoch = 0)
    {
        long pads = 0, positions = 0;
        foreach (var batch in plan.Batches(set, epoch))
        {
            int longest = 0;
            long real = 0;
            foreach (int r in batch)
            {
                int len = set.Length(r);
                longest = Math.Max(longest, len);
                real += len;
            }
            positions += (long)batch.Length * longest;
            pads += (long)batch.Length * longest - real;
        }
        return positions == 0 ? 0 : (double)pads / positions;
    }
}
