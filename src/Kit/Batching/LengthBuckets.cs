using Kit.Common;
using Kit.Data;

namespace Kit.Batching;

/// <summary>
/// Batches of rows with similar lengths, so little of each padded batch is padding.
///
/// Rows are grouped into length buckets (explicit inclusive upper bounds, or automatic: one bucket per length,
/// neighbouring lengths merged until a bucket holds at least one full batch). Each epoch, rows are shuffled
/// inside their bucket and cut into batches; each bucket's incomplete tail joins a common pool that is sorted
/// by length and cut the same way, so at most one batch of the epoch is short. Finally the batch order is
/// shuffled. All shuffles are seeded by (seed, epoch).
///
/// With a token budget a batch closes before B × (its longest length) would exceed the budget, counting pad
/// positions as the engine pays for them; <c>batchSize</c> still caps the row count.
/// </summary>
public sealed class LengthBuckets : IBatchPlan
{
    public int BatchSize { get; }
    public ulong Seed { get; }
    public int? TokenBudget { get; }
    /// <summary>Inclusive upper length of each bucket, ascending; null for automatic buckets.</summary>
    public IReadOnlyList<int>? Boundaries { get; }

    public LengthBuckets(int batchSize, ulong seed, int? tokenBudget = null, IReadOnlyList<int>? boundaries = null)
    {
        if (batchSize <= 0) throw new ArgumentOutOfRangeException(nameof(batchSize), batchSize, "batch size must be positive");
        if (tokenBudget is <= 0) throw new ArgumentOutOfRangeException(nameof(tokenBudget), tokenBudget, "token budget must be positive");
        if (boundaries is not null)
        {
            if (boundaries.Count == 0) throw new ArgumentException("boundaries must not be empty (pass null for automatic buckets)", nameof(boundaries));
            for (int i = 0; i < boundaries.Count; i++)
                if (boundaries[i] <= 0 || (i > 0 && boundaries[i] <= boundaries[i - 1]))
                    throw new ArgumentException($"boundaries must be positive and strictly ascending (entry {i} is {boundaries[i]})", nameof(boundaries));
        }
        BatchSize = batchSize;
        Seed = seed;
        TokenBudget = tokenBudget;
        Boundaries = boundaries?.ToArray();
    }

    public IEnumerable<int[]> Batches(EncodedSet set, int epoch)
    {
        var lengths = set.Lengths();
        if (TokenBudget is int budget)
            for (int r = 0; r < lengths.Length; r++)
                if (lengths[r] > budget)
                    throw new ArgumentException(
                        $"row {r} (source row {set.SourceRows[r]}) has {lengths[r]} tokens, more than the token budget {budget}");

        var rng = SplitMix64.ForEpoch(Seed, epoch);
        var batches = new List<int[]>();
        var pool = new List<int>();
        foreach (var bucket in Buckets(lengths))
        {
            rng.Shuffle(bucket.AsSpan());
            pool.AddRange(Cut(bucket, lengths, batches));
        }
        // Stable sort keeps the shuffled order among equal lengths.
        var tail = pool.OrderBy(r => lengths[r]).ToArray();
        var last = Cut(tail, lengths, batches);
        if (last.Length > 0) batches.Add(last);

        var order = batches.ToArray();
        rng.Shuffle(order.AsSpan());
        return order;
    }

    /// <summary>Appends complete batches cut from <paramref name="rows"/> in order; returns the incomplete rest.</summary>
    int[] Cut(int[] rows, int[] lengths, List<int[]> batches)
    {
        int start = 0, longest = 0;
        for (int k = 0; k < rows.Length; k++)
        {
            int count = k - start;
            int grown = Math.Max(longest, lengths[rows[k]]);
            bool overBudget = TokenBudget is int budget && (long)(count + 1) * grown > budget;
            if (count == BatchSize || overBudget)
            {
                batches.Add(rows[start..k]);
                start = k;
                grown = lengths[rows[k]];
            }
            longest = grown;
        }
        if (rows.Length - start == BatchSize)
        {
            batches.Add(rows[start..]);
            return Array.Empty<int>();
        }
        return rows[start..];
    }

    List<int[]> Buckets(int[] lengths)
    {
        int maxLen = lengths.Length == 0 ? 0 : lengths.Max();
        var bounds = Boundaries ?? AutomaticBoundaries(lengths, maxLen, BatchSize);
        var members = new List<int>[bounds.Count + 1];
        for (int i = 0; i < members.Length; i++) members[i] = new List<int>();
        for (int r = 0; r < lengths.Length; r++)
        {
            int b = 0;
            while (b < bounds.Count && lengths[r] > bounds[b]) b++;
            members[b].Add(r);
        }
        return members.Where(m => m.Count > 0).Select(m => m.ToArray()).ToList();
    }

    /// <summary>Upper bounds so that each bucket spans as few lengths as possible while holding a full batch.</summary>
    internal static IReadOnlyList<int> AutomaticBoundaries(int[] lengths, int maxLen, int batchSize)
    {
        var histogram = new int[maxLen + 1];
        foreach (int l in lengths) histogram[l]++;
        var bounds = new List<int>();
        int held = 0;
        for (int l = 0; l <= maxLen; l++)
        {
            held += histogram[l];
            if (held >= batchSize)
            {
                bounds.Add(l);
                held = 0;
            }
        }
        return bounds;
    }
}
