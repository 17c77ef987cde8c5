using System.Text.Json;
using System.Text.Json.Nodes;

namespace Kit.Data;

/// <summary>
/// Token strings to ids. Id 0 is padding and id 1 stands for any token not in the vocabulary; real tokens follow
/// by descending training count, ties in ordinal order, so the same training pieces always give the same ids.
/// Build it from the training part only: ids learnt from validation or test rows are a quiet form of leakage.
/// </summary>
public sealed class Vocabulary
{
    public const int PadId = 0, UnknownId = 1;
    public const string PadToken = "<pad>", UnknownToken = "<unk>";
    public const string Format = "kit-vocabulary";
    public const int FormatVersion = 1;

    readonly string[] _tokens;
    readonly long[] _counts;
    readonly Dictionary<string, int> _ids;

    /// <summary>Entries including the two reserved ids.</summary>
    public int Count => _tokens.Length;
    public int MinCount { get; }
    public int? MaxSize { get; }
    public IReadOnlyList<string> Tokens => _tokens;

    Vocabulary(string[] tokens, long[] counts, int minCount, int? maxSize, string source)
    {
        if (tokens.Length < 2 || tokens[PadId] != PadToken || tokens[UnknownId] != UnknownToken)
            throw new DataError(source, 0, $"a vocabulary must start with '{PadToken}' and '{UnknownToken}'");
        if (counts.Length != tokens.Length) throw new DataError(source, 0, $"{counts.Length} counts for {tokens.Length} tokens");
        _tokens = tokens;
        _counts = counts;
        MinCount = minCount;
        MaxSize = maxSize;
        _ids = new Dictionary<string, int>(tokens.Length, StringComparer.Ordinal);
        for (int i = 2; i < tokens.Length; i++)
            if (!_ids.TryAdd(tokens[i], i)) throw new DataError(source, 0, $"token '{tokens[i]}' appears twice (ids {_ids[tokens[i]]} and {i})");
    }

    /// <param name="minCount">Tokens seen fewer times than this map to the unknown id.</param>
    /// <param name="maxSize">Cap on <see cref="Count"/>, reserved ids included; the rarest tokens go first.</param>
    public static Vocabulary Build(IEnumerable<IReadOnlyList<string>> pieces, int minCount = 1, int? maxSize = null)
    {
        if (minCount < 1) throw new ArgumentOutOfRangeException(nameof(minCount), "minCount must be at least 1");
        if (maxSize is < 2) throw new ArgumentOutOfRangeException(nameof(maxSize), "maxSize counts the two reserved ids, so it must be at least 2");
        var counts = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (var row in pieces)
            foreach (var token in row)
                counts[token] = counts.GetValueOrDefault(token) + 1;
        var kept = counts.Where(p => p.Value >= minCount)
            .OrderByDescending(p => p.Value).ThenBy(p => p.Key, StringComparer.Ordinal);
        var chosen = (maxSize is int m ? kept.Take(m - 2) : kept).ToList();
        var tokens = new[] { PadToken, UnknownToken }.Concat(chosen.Select(p => p.Key)).ToArray();
        var tokenCounts = new long[] { 0, 0 }.Concat(chosen.Select(p => p.Value)).ToArray();
        return new Vocabulary(tokens, tokenCounts, minCount, maxSize, "vocabulary");
    }

    /// <summary>A closed vocabulary in the given order after the reserved ids (e.g. the 256 bytes).</summary>
    public static Vocabulary FromTokens(IEnumerable<string> tokens)
    {
        var all = new[] { PadToken, UnknownToken }.Concat(tokens).ToArray();
        return new Vocabulary(all, new long[all.Length], 1, null, "vocabulary");
    }

    public int Id(string token) => _ids.TryGetValue(token, out int id) ? id : UnknownId;

    public bool Contains(string token) => _ids.ContainsKey(token);

    public string Token(int id) => (uint)id < (uint)_tokens.Length
        ? _tokens[id]
        : throw new ArgumentOutOfRangeException(nameof(id), $"id {id} is outside the vocabulary (0..{_tokens.Length - 1})");

    /// <summary>How often the token was seen when the vocabulary was built (0 for reserved ids and closed vocabularies).</summary>
    public long TrainingCount(int id) => _counts[id];

    public int[] Ids(IReadOnlyList<string> pieces)
    {
        var ids = new int[pieces.Count];
        for (int i = 0; i < ids.Length; i++) ids[i] = Id(pieces[i]);
        return ids;
    }

    /// <summary>Share of token occurrences (and of distinct tokens) in <paramref name="pieces"/> that this vocabulary knows.</summary>
    public VocabularyCoverage Coverage(IEnumerable<IReadOnlyList<string>> pieces, string part = "")
    {
        long total = 0, unknown = 0;
        var types = new HashSet<string>(StringComparer.Ordinal);
        int unknownTypes = 0;
        foreach (var row in pieces)
            foreach (var token in row)
            {
                total++;
                bool known = _ids.ContainsKey(token);
                if (!known) unknown++;
                if (types.Add(token) && !known) unknownTypes++;
            }
        return new VocabularyCoverage(part, total, unknown, types.Count, unknownTypes);
    }

    public string ToJson()
    {
        var root = new JsonObject
        {
            ["format"] = Format,
            ["version"] = FormatVersion,
            ["minCount"] = MinCount,
            ["maxSize"] = MaxSize,
            ["tokens"] = new JsonArray(_tokens.Select(t => (JsonNode?)JsonValue.Create(t)).ToArray()),
            ["counts"] = new JsonArray(_counts.Select(c => (JsonNode?)JsonValue.Create(c)).ToArray()),
        };
        return root.ToJsonString(new JsonSerializerOptions { WriteIndented = false });
    }

    public static Vocabulary FromJson(string json) => FromJson(json, "vocabulary JSON");

    public void Save(string path) => File.WriteAllText(path, ToJson());

    public static Vocabulary Load(string path) => FromJson(File.ReadAllText(path), path);

    static Vocabulary FromJson(string json, string source)
    {
        JsonNode? root;
        try
        {
            root = JsonNode.Parse(json);
        }
        catch (JsonException e)
        {
            throw new DataError(source, (int)(e.LineNumber ?? 0) + 1, (int?)e.BytePositionInLine + 1, $"invalid JSON: {e.Message}", e);
        }
        if (root is not JsonObject o) throw new DataError(source, 1, "a vocabulary file holds one JSON object");
        if ((string?)o["format"] != Format) throw new DataError(source, 1, $"not a vocabulary file (format is not '{Format}')");
        int version = (int?)o["version"] ?? -1;
        if (version != FormatVersion) throw new DataError(source, 1, $"vocabulary version {version} is not supported (this build reads {FormatVersion})");
        try
        {
            var tokens = o["tokens"]!.AsArray().Select(t => (string)t!).ToArray();
            var counts = o["counts"]!.AsArray().Select(c => (long)c!).ToArray();
            return new Vocabulary(tokens, counts, (int?)o["minCount"] ?? 1, (int?)o["maxSize"], source);
        }
        catch (Exception e) when (e is InvalidOperationException or FormatException or NullReferenceException or ArgumentException)
        {
            throw new DataError(source, 1, null, $"vocabulary file is malformed: {e.Message}", e);
        }
    }
}
