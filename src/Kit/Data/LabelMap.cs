namespace Kit.Data;

/// <summary>Class names and their ids. Ids follow ordinal order of the names, so they do not depend on row order.</summary>
public sealed class LabelMap
{
    readonly Dictionary<string, int> _ids;
    public IReadOnlyList<string> Names { get; }
    public int Count => Names.Count;

    public LabelMap(IEnumerable<string> names)
    {
        Names = names.Distinct(StringComparer.Ordinal).OrderBy(n => n, StringComparer.Ordinal).ToArray();
        _ids = Names.Select((n, i) => (n, i)).ToDictionary(p => p.n, p => p.i, StringComparer.Ordinal);
    }

    public int this[string name] => _ids.TryGetValue(name, out var id)
        ? id
        : throw new KeyNotFoundException($"unknown label '{name}'; known labels: {string.Join(", ", Names)}");

    public bool TryGetId(string name, out int id) => _ids.TryGetValue(name, out id);
}
