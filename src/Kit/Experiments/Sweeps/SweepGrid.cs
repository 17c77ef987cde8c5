namespace Kit.Experiments;

/// <summary>
/// Reads a grid such as "cell=gru,lstm; embed=16,64" into every combination of its values (here four configs),
/// the first key varying slowest. An empty grid is the single base config.
/// </summary>
public static class SweepGrid
{
    public static IReadOnlyList<SweepConfig> Parse(string? grid)
    {
        var axes = new List<(string Key, string[] Values)>();
        foreach (var part in (grid ?? "").Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            int eq = part.IndexOf('=');
            if (eq <= 0 || eq == part.Length - 1)
                throw new ArgumentException($"grid part '{part}' should look like key=value1,value2");
            string key = part[..eq].Trim();
            var values = part[(eq + 1)..].Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            if (values.Length == 0) throw new ArgumentException($"grid part '{part}' lists no values");
            if (values.Any(v => v.Contains("..", StringComparison.Ordinal)))
                throw new ArgumentException($"grid part '{part}' is a range; ranges are drawn from only by a search (add --search N), a grid lists values");
            if (axes.Any(a => string.Equals(a.Key, key, StringComparison.OrdinalIgnoreCase)))
                throw new ArgumentException($"grid key '{key}' appears twice");
            if (values.Distinct(StringComparer.OrdinalIgnoreCase).Count() != values.Length)
                throw new ArgumentException($"grid key '{key}' repeats a value");
            axes.Add((key, values));
        }
        IEnumerable<(string, string)[]> combos = [[]];
        foreach (var (key, values) in axes)
            combos = combos.SelectMany(c => values.Select(v => c.Append((key, v)).ToArray())).ToArray();
        return combos.Select(SweepConfig.Of).ToArray();
    }
}
