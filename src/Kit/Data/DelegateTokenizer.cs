namespace Kit.Data;

/// <summary>A tokenizer given as a function. Its <see cref="TokenizerSpec"/> records only the name, so rebuilding it needs the same function again.</summary>
public sealed class DelegateTokenizer : ITokenizer
{
    readonly Func<string, IReadOnlyList<string>> _split;
    public string Name { get; }

    public DelegateTokenizer(string name, Func<string, IReadOnlyList<string>> split)
    {
        if (string.IsNullOrWhiteSpace(name)) throw new ArgumentException("a delegate tokenizer needs a name", nameof(name));
        Name = name;
        _split = split;
    }

    public IReadOnlyList<string> Split(string text) =>
        _split(text) ?? throw new InvalidOperationException($"tokenizer '{Name}' returned null for a text");
}
