namespace Kit.Diagnostics;

/// <summary>
/// SplitMix64 (Steele, Lea and Flood 2014, "Fast splittable pseudorandom number generators"): a tiny generator
/// whose stream depends only on the seed, so bootstrap intervals and t-SNE layouts repeat exactly across
/// runtimes, unlike <see cref="System.Random"/> whose algorithm is not specified.
/// </summary>
internal sealed class SeededRandom(ulong seed)
{
    ulong _state = seed;
    double? _spareGaussian;

    public ulong NextULong()
    {
        ulong z = _state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>Uniform in [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (NextULong() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Uniform integer in [0, n), unbiased (Lemire 2019, multiply-and-reject).</summary>
    public int NextInt(int n)
    {
        if (n <= 0) throw new ArgumentOutOfRangeException(nameof(n), $"n = {n} must be positive.");
        ulong range = (ulong)n;
        while (true)
        {
            ulong x = NextULong() >> 32;
            ulong m = x * range;
            if ((uint)m >= (uint)((0x1_0000_0000UL - range) % range)) return (int)(m >> 32);
        }
    }

    /// <summary>Standard normal by the Box–Muller transform.</summary>
    public double NextGaussian()
    {
        if (_spareGaussian is double spare) { _spareGaussian = null; return spare; }
        double u1 = 1.0 - NextDouble(), u2 = NextDouble();
        double r = Math.Sqrt(-2.0 * Math.Log(u1));
        _spareGaussian = r * Math.Sin(2 * Math.PI * u2);
        return r * Math.Cos(2 * Math.PI * u2);
    }
}
