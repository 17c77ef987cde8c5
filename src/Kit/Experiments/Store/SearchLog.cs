using System.Text;
using System.Text.Json;
using System.Text.Json.Serialization;
using Kit.Data;

namespace Kit.Experiments;

/// <summary>What a search decided: which configs a rung trains and for how many epochs, a stop, or the final pick.</summary>
public enum SearchStepKind { Rung, Stop, Choice }

/// <summary>
/// One decision of a search, kept in the results folder beside the runs so a rerun (or another shard) makes the
/// same one: for a rung, the configs promoted into it (by their drawn names) and its epochs (fewer than planned
/// when the budget shrank it), with the budget figures it was made on; for a stop, why; for the choice, the
/// config picked and where its model was written.
/// </summary>
public sealed record SearchDecision
{
    public required SearchStepKind Kind { get; init; }
    public required int Rung { get; init; }
    public int Epochs { get; init; }
    public int PlannedEpochs { get; init; }
    public required IReadOnlyList<string> Configs { get; init; }
    /// <summary>Estimated wall seconds of the rung, and what was left of the budget when it was planned (null: no budget).</summary>
    public double? EstimatedSeconds { get; init; }
    public double? RemainingSeconds { get; init; }
    public string Note { get; init; } = "";
    /// <summary>For the choice: the chosen model's file, relative to the results folder.</summary>
    public string? ModelFile { get; init; }

    static readonly JsonSerializerOptions Json = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        Converters = { new JsonStringEnumConverter(JsonNamingPolicy.SnakeCaseLower) },
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
    };

    public string ToJsonLine() => JsonSerializer.Serialize(this, Json);

    public static SearchDecision FromJson(string line) =>
        JsonSerializer.Deserialize<SearchDecision>(line, Json) ?? throw new JsonException("the line holds null");

    /// <summary>Two processes may both record a decision; the first one in the folder counts.</summary>
    public (SearchStepKind, int) Slot => (Kind, Rung);
}

/// <summary>
/// The decisions of a search: search.jsonl, or search.shard-I-of-N.jsonl per shard (each process appends only to
/// its own file, with the same crash-safe append as the runs). Reading takes every file; a torn final line is left
/// out (the decision is made again from the same records), any other bad line is an error naming file and line.
/// </summary>
public static class SearchLog
{
    public const string MainFile = "search.jsonl";

    public static string FileName(Shard shard) => shard.IsWhole ? MainFile : $"search.shard-{shard.Index}-of-{shard.Count}.jsonl";

    public static bool Exists(string dir) => Files(dir).Count > 0;

    static IReadOnlyList<string> Files(string dir)
    {
        if (!Directory.Exists(dir)) return [];
        var files = Directory.GetFiles(dir, "search.shard-*-of-*.jsonl").Order(StringComparer.Ordinal).ToList();
        string main = Path.Combine(dir, MainFile);
        if (File.Exists(main)) files.Insert(0, main);
        return files;
    }

    /// <summary>Every decision in the folder, first occurrence of each (kind, rung) kept, in rung order.</summary>
    public static IReadOnlyList<SearchDecision> Read(string dir)
    {
        var found = new Dictionary<(SearchStepKind, int), SearchDecision>();
        foreach (var file in Files(dir))
        {
            var lines = Encoding.UTF8.GetString(File.ReadAllBytes(file)).Split('\n');
            for (int i = 0; i < lines.Length; i++)
            {
                if (lines[i].Length == 0) { if (i != lines.Length - 1) throw new DataError(file, i + 1, null, "empty line in a search log"); continue; }
                if (i == lines.Length - 1) continue; // torn: the decision is made again
                SearchDecision d;
                try { d = SearchDecision.FromJson(lines[i]); }
                catch (JsonException e) { throw new DataError(file, i + 1, null, $"not a search decision: {e.Message}", e); }
                found.TryAdd(d.Slot, d);
            }
        }
        return found.Values.OrderBy(d => d.Rung).ThenBy(d => d.Kind).ToArray();
    }
}
