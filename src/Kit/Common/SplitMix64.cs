namespace Kit.Common;

/// <summary>
/// SplitMix64 (Steele, Lea and Flood 2014), the one seeded generator of the kit. Every seeded step (splits,
/// batch plans, bootstraps, t-SNE initialisation) uses it rather than System.Random, so results depend only on the
/// seed and never on the runtime's choice of algorithm.
/// </summary>
internal sealed class SplitMix64(ulong seed)
{
    ulong _state = seed;
    double? _spareGaussian;

    public ulong Next()
    {
        ulong z = _state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>Uniform in [0, bound), by rejection so that no value is favoured.</summary>
    public int NextInt(int bound)
    {
        if (bound <= 0) throw new ArgumentOutOfRangeException(nameof(bound), $"bound = {bound} must be positive");
        ulong b = (ulong)bound, limit = ulong.MaxValue - ulong.MaxValue % b;
        ulong x;
        do x = Next(); while (x >= limit);
        return (int)(x % b);
    }

    /// <summary>Uniform in [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (Next() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Standard normal by the Box–Muller transform (the second value of each pair is kept for the next call).</summary>
    public double NextGaussian()
    {
        if (_spareGaussian is double spare) { _spareGaussian = null; return spare; }
        double u1 = 1.0 - NextDouble(), u2 = NextDouble();
        double r = Math.Sqrt(-2.0 * Math.Log(u1));
        _spareGaussian = r * Math.Sin(2 * Math.PI * u2);
        return r * Math.Cos(2 * Math.PI * u2);
    }

    /// <summary>Fisher–Yates shuffle in place.</summary>
    public void Shuffle<T>(Span<T> items)
    {
        for (int i = items.Length - 1; i > 0; i--)
        {
            int j = NextInt(i + 1);
            (items[i], items[j]) = (items[j], items[i]);
        }
    }

    /// <summary>An independent stream for one epoch of a seeded run, so epoch k can be replayed without 1..k-1.</summary>
    public static SplitMix64 ForEpoch(ulong seed, int epoch)
    {
        var mixer = new SplitMix64(seed ^ (0xD1B54A32D192ED03UL * (ulong)(uint)epoch));
        return new SplitMix64(mixer.Next());
    }
}
