using System.Globalization;
using Kit.Common;

namespace Kit.Experiments;

/// <summary>One axis of a search space: a list of values to pick from, or a numeric range to draw from.</summary>
public abstract record SearchAxis(string Key)
{
    internal abstract string Draw(SplitMix64 rng);
    public abstract string Describe();
}

/// <summary>"encoder=gru,lstm,cnn": each value equally likely.</summary>
public sealed record ListAxis(string Key, IReadOnlyList<string> Values) : SearchAxis(Key)
{
    internal override string Draw(SplitMix64 rng) => Values[rng.NextInt(Values.Count)];
    public override string Describe() => $"{Key}={string.Join(",", Values)}";
}

/// <summary>
/// "hidden=32..256:log" or "dropout=0..0.5": a value drawn uniformly between the ends (uniformly in the logarithm
/// with ":log", so each factor of ten is as likely as the next). How a draw becomes the value in the config's name,
/// so names stay short and stable: sizes (embed, hidden) round to the nearest multiple of <see cref="SizeStep"/>
/// (Transformer heads of 1, 2, 4 or 8 then always divide the hidden size), other integer settings to the nearest
/// integer (halves away from zero), both kept inside the range; real numbers are rounded to two significant
/// digits (lr=0.0032, dropout=0.25), and the rounded value is the one trained.
/// </summary>
public sealed record RangeAxis(string Key, double Low, double High, bool Log, bool Integer) : SearchAxis(Key)
{
    public const int SizeStep = 8;

    internal override string Draw(SplitMix64 rng) => Format(Value(rng.NextDouble()));

    /// <summary>The value at position <paramref name="u"/> ∈ [0, 1) of the range, before rounding.</summary>
    public double Value(double u) => Log ? Math.Exp(Math.Log(Low) + u * (Math.Log(High) - Math.Log(Low))) : Low + u * (High - Low);

    /// <summary>A drawn value as it goes into the config (rounded as the type says).</summary>
    public string Format(double v)
    {
        var inv = CultureInfo.InvariantCulture;
        if (Integer)
        {
            int step = Key is "hidden" or "embed" ? SizeStep : 1;
            double lo = Math.Ceiling(Low / step) * step, hi = Math.Floor(High / step) * step;
            if (hi < lo) lo = hi = Math.Max(step, Math.Round(Low / step, MidpointRounding.AwayFromZero) * step);
            double r = Math.Clamp(Math.Round(v / step, MidpointRounding.AwayFromZero) * step, lo, hi);
            return ((long)r).ToString(inv);
        }
        if (v == 0) return "0";
        double scale = Math.Pow(10, Math.Floor(Math.Log10(Math.Abs(v))) - 1);
        double rounded = Math.Clamp(Math.Round(v / scale, MidpointRounding.AwayFromZero) * scale, Low, High);
        return double.Parse(rounded.ToString("G2", inv), inv).ToString("R", inv).ToLowerInvariant();
    }

    public override string Describe() => FormattableString.Invariant($"{Key}={Low:R}..{High:R}{(Log ? ":log" : "")}");
}

/// <summary>
/// What a search draws its configs from: a grid whose keys hold value lists ("encoder=gru,lstm") or ranges
/// ("hidden=32..256:log; dropout=0..0.5"). <see cref="Sample"/> draws configs with a seeded generator, so the same
/// space, count and seed always give the same configs in the same order.
/// </summary>
public sealed class SearchSpace
{
    /// <summary>
    /// The space a search uses when no grid is given: every encoder family, a hidden size from 32 to 128, last or max
    /// pooling, dropout up to one half and a learning rate between 0.001 and 0.01 (each factor equally likely).
    /// Chosen by measurement on the demo and WordNet sets (docs/benchmarks.md, "Search defaults"): with hidden sizes
    /// up to 256 the first rung's wide Transformer configs spent a 3-minute budget on their own, and the
    /// search stopped at one epoch below the linear baseline on two of three sets; this space finished every rung
    /// and beat the linear baseline on all three.
    /// </summary>
    public const string DefaultText = "encoder=gru,lstm,cnn,transformer; hidden=32..128:log; dropout=0..0.5; lr=1e-3..1e-2:log; pooling=last,max";

    public IReadOnlyList<SearchAxis> Axes { get; }
    public bool HasRanges => Axes.Any(a => a is RangeAxis);

    SearchSpace(IReadOnlyList<SearchAxis> axes) => Axes = axes;

    public static SearchSpace Default { get; } = Parse(DefaultText);

    /// <summary>The space in a fixed written form (what a results folder's description records).</summary>
    public string Describe() => string.Join("; ", Axes.Select(a => a.Describe()));

    public override string ToString() => Describe();

    /// <summary>Reads "key=v1,v2; key=lo..hi[:log]"; every problem is an <see cref="ArgumentException"/> naming the part.</summary>
    public static SearchSpace Parse(string? text)
    {
        var axes = new List<SearchAxis>();
        var inv = CultureInfo.InvariantCulture;
        foreach (var part in (text ?? "").Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            int eq = part.IndexOf('=');
            if (eq <= 0 || eq == part.Length - 1)
                throw new ArgumentException($"grid part '{part}' should look like key=value1,value2 or key=low..high[:log]");
            string key = part[..eq].Trim().ToLowerInvariant(), body = part[(eq + 1)..].Trim();
            if (axes.Any(a => a.Key == key)) throw new ArgumentException($"grid key '{key}' appears twice");
            if (key == "epochs")
                throw new ArgumentException("grid key 'epochs' cannot be searched: successive halving sets each rung's epochs (give the most as --epochs)");
            var setting = RunSettings.GridKeys.FirstOrDefault(k => k.Key == key);
            if (!body.Contains(".."))
            {
                var values = body.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries).Select(v => v.ToLowerInvariant()).ToArray();
                if (values.Length == 0) throw new ArgumentException($"grid part '{part}' lists no values");
                if (values.Distinct().Count() != values.Length) throw new ArgumentException($"grid key '{key}' repeats a value");
                foreach (var v in values) SweepConfig.Of((key, v)); // checks key and value
                axes.Add(new ListAxis(key, values));
                continue;
            }
            bool log = false;
            string range = body;
            int colon = body.IndexOf(':');
            if (colon >= 0)
            {
                string scale = body[(colon + 1)..].Trim();
                if (scale != "log") throw new ArgumentException($"grid part '{part}': after the range only ':log' may follow, not ':{scale}'");
                log = true;
                range = body[..colon];
            }
            int dots = range.IndexOf("..", StringComparison.Ordinal);
            string loText = range[..dots].Trim(), hiText = range[(dots + 2)..].Trim();
            if (setting is null) SweepConfig.Of((key, loText)); // names the unknown or data-shaping key
            bool integer = setting!.Accepts == "a positive integer";
            bool real = setting.Accepts is "a positive number" or "a non-negative number" or "a rate in [0, 1)" or "none or a rate in [0, 1)";
            if (!integer && !real)
                throw new ArgumentException($"grid part '{part}': {key} takes {setting.Accepts}, so it needs a list of values, not a range");
            if (!double.TryParse(loText, NumberStyles.Float, inv, out double lo) || !double.TryParse(hiText, NumberStyles.Float, inv, out double hi)
                || !double.IsFinite(lo) || !double.IsFinite(hi))
                throw new ArgumentException($"grid part '{part}': a range is low..high with two numbers (e.g. 1e-3..1e-2)");
            if (!(lo < hi)) throw new ArgumentException($"grid part '{part}': the low end {loText} must be below the high end {hiText}");
            if (log && lo <= 0) throw new ArgumentException($"grid part '{part}': a :log range needs a positive low end");
            var axis = new RangeAxis(key, lo, hi, log, integer);
            foreach (var end in new[] { lo, hi })
            {
                try { SweepConfig.Of((key, axis.Format(end))); }
                catch (ArgumentException) { throw new ArgumentException($"grid part '{part}': {key} takes {setting.Accepts}; {end.ToString("R", inv)} is outside it"); }
            }
            axes.Add(axis);
        }
        return new SearchSpace(axes);
    }

    /// <summary>
    /// <paramref name="count"/> distinct configs drawn with a generator seeded by <paramref name="seed"/> (axes drawn
    /// in their written order, a repeat of an earlier config drawn again). A space with too few distinct configs is
    /// an <see cref="ArgumentException"/> saying how many it holds.
    /// </summary>
    public IReadOnlyList<SweepConfig> Sample(int count, ulong seed)
    {
        if (count < 1) throw new ArgumentException($"--search {count}: at least one config");
        long distinct = HasRanges ? long.MaxValue : Axes.Aggregate(1L, (n, a) => n * ((ListAxis)a).Values.Count);
        if (count > distinct)
            throw new ArgumentException($"--search {count}: the grid holds only {distinct} distinct configs; ask for at most {distinct} or give a range");
        var rng = new SplitMix64(seed);
        var configs = new List<SweepConfig>();
        var names = new HashSet<string>(StringComparer.Ordinal);
        for (int attempt = 0; configs.Count < count; attempt++)
        {
            if (attempt > 1000 * count)
                throw new ArgumentException($"--search {count}: only {configs.Count} distinct configs found in {attempt} draws; widen the ranges");
            var config = SweepConfig.Of(Axes.Select(a => (a.Key, a.Draw(rng))).ToArray());
            if (names.Add(config.Name)) configs.Add(config);
        }
        return configs;
    }
}
