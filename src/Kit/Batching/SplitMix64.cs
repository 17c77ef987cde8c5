namespace Kit.Batching;

/// <summary>
/// Small seeded generator for shuffles whose output must not change between .NET versions (System.Random's
/// sequence is not promised to). SplitMix64: Steele, Lea and Flood, "Fast splittable pseudorandom number
/// generators", OOPSLA 2014; constants as published there.
/// </summary>
internal sealed class SplitMix64(ulong seed)
{
    ulong _state = seed;

    public ulong Next()
    {
        ulong z = _state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>Uniform integer in [0, n) by rejection, so small n carry no modulo bias.</summary>
    public int Below(int n)
    {
        if (n <= 0) throw new ArgumentOutOfRangeException(nameof(n));
        ulong bound = (ulong)n;
        ulong limit = ulong.MaxValue - ulong.MaxValue % bound;
        ulong x;
        do x = Next(); while (x >= limit);
        return (int)(x % bound);
    }

    /// <summary>Fisher–Yates shuffle of a span in place.</summary>
    public void Shuffle<T>(Span<T> items)
    {
        for (int i = items.Length - 1; i > 0; i--)
        {
            int j = Below(i + 1);
            (items[i], items[j]) = (items[j], items[i]);
        }
    }

    /// <summary>A generator for one (seed, epoch) pair; different epochs give unrelated streams.</summary>
    public static SplitMix64 ForEpoch(ulong seed, int epoch)
    {
        var mixer = new SplitMix64(seed ^ (0xD1B54A32D192ED03UL * (ulong)(uint)epoch));
        return new SplitMix64(mixer.Next());
    }
}
