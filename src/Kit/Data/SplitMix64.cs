namespace Kit.Data;

/// <summary>
/// Seeded 64-bit generator (Steele, Lea and Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014;
/// constants as in Vigna's public-domain splitmix64.c). Used instead of System.Random so a seed means the same
/// split on every .NET version.
/// </summary>
public sealed class SplitMix64
{
    ulong _state;

    public SplitMix64(ulong seed) => _state = seed;

    public ulong Next()
    {
        ulong z = _state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>Uniform in [0, bound) without modulo bias (rejection of the short last stretch).</summary>
    public int NextInt(int bound)
    {
        if (bound <= 0) throw new ArgumentOutOfRangeException(nameof(bound), "bound must be positive");
        ulong b = (ulong)bound, limit = ulong.MaxValue - ulong.MaxValue % b;
        ulong x;
        do x = Next(); while (x >= limit);
        return (int)(x % b);
    }

    /// <summary>Uniform in [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (Next() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Fisher–Yates (Durstenfeld) shuffle in place.</summary>
    public void Shuffle<T>(Span<T> items)
    {
        for (int i = items.Length - 1; i > 0; i--)
        {
            int j = NextInt(i + 1);
            (items[i], items[j]) = (items[j], items[i]);
        }
    }
}
