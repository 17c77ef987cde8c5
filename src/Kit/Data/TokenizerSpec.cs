using System.Text.Json;
using System.Text.Json.Serialization;

namespace Kit.Data;

/// <summary>
/// What a saved model needs to rebuild its tokenizer: the kind and its options. A delegate tokenizer is
/// stored by name only; <see cref="Create"/> then needs a resolver that returns the same function again.
/// </summary>
public sealed record TokenizerSpec(string Kind, bool FoldCase = false, bool LowerCase = true, string? Name = null)
{
    public const int FormatVersion = 1;
    public const string Character = "character", Byte = "byte", Word = "word", Delegate = "delegate";

    public static TokenizerSpec Of(ITokenizer tokenizer) => tokenizer switch
    {
        CharacterTokenizer c => new TokenizerSpec(Character, FoldCase: c.FoldCase, LowerCase: false),
        ByteTokenizer => new TokenizerSpec(Byte, LowerCase: false),
        WordTokenizer w => new TokenizerSpec(Word, LowerCase: w.LowerCase),
        _ => new TokenizerSpec(Delegate, LowerCase: false, Name: tokenizer.Name),
    };

    public ITokenizer Create(Func<string, ITokenizer>? resolveDelegate = null) => Kind switch
    {
        Character => new CharacterTokenizer(FoldCase),
        Byte => new ByteTokenizer(),
        Word => new WordTokenizer(LowerCase),
        Delegate when resolveDelegate is not null => Check(resolveDelegate(Name ?? "")),
        Delegate => throw new InvalidOperationException($"tokenizer '{Name}' was a user function; pass a resolver that returns it to rebuild it"),
        _ => throw new InvalidOperationException($"unknown tokenizer kind '{Kind}' (known: {Character}, {Byte}, {Word}, {Delegate})"),
    };

    ITokenizer Check(ITokenizer t) => t.Name == Name ? t
        : throw new InvalidOperationException($"the resolver returned tokenizer '{t.Name}' for '{Name}'");

    sealed record Stored(int Version, string Kind, bool FoldCase, bool LowerCase, string? Name);

    static readonly JsonSerializerOptions Json = new() { PropertyNamingPolicy = JsonNamingPolicy.CamelCase, DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull };

    public string ToJson() => JsonSerializer.Serialize(new Stored(FormatVersion, Kind, FoldCase, LowerCase, Name), Json);

    public static TokenizerSpec FromJson(string json)
    {
        var s = JsonSerializer.Deserialize<Stored>(json, Json) ?? throw new InvalidDataException("tokenizer spec: empty JSON");
        if (s.Version != FormatVersion) throw new InvalidDataException($"tokenizer spec: version {s.Version} is not supported (this build reads {FormatVersion})");
        return new TokenizerSpec(s.Kind, s.FoldCase, s.LowerCase, s.Name);
    }
}
