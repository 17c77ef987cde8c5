namespace Kit.DemoData;

/// <summary>
/// SplitMix64 (Steele, Lea and Flood 2014). Our own generator rather than System.Random, so that the demo files
/// stay identical bit for bit whatever the runtime version does to its default algorithm.
/// </summary>
public sealed class SeededRandom(ulong seed)
{
    ulong _state = seed;

    public ulong NextUInt64()
    {
        ulong z = _state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>Uniform in [0, n) by rejection, so no value is favoured.</summary>
    public int Next(int n)
    {
        if (n <= 0) throw new ArgumentOutOfRangeException(nameof(n));
        ulong bound = (ulong)n;
        ulong limit = ulong.MaxValue - ulong.MaxValue % bound;
        ulong r;
        do r = NextUInt64(); while (r >= limit);
        return (int)(r % bound);
    }

    /// <summary>Uniform in [lo, hi] inclusive.</summary>
    public int Between(int lo, int hi) => lo + Next(hi - lo + 1);

    public double NextDouble() => (NextUInt64() >> 11) * (1.0 / (1UL << 53));

    public bool Chance(double p) => NextDouble() < p;

    public T Pick<T>(IReadOnlyList<T> items) => items[Next(items.Count)];

    /// <summary>A geometric-like long tail: extra length with probability p per step, capped.</summary>
    public int Tail(double p, int cap)
    {
        int n = 0;
        while (n < cap && Chance(p)) n++;
        return n;
    }
}
