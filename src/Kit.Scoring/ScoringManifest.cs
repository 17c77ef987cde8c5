using System.Text.Json;
using System.Text.Json.Nodes;

namespace Kit.Scoring;

/// <summary>
/// What travels with an exported graph so a consumer needs nothing else: tokenizer rules, vocabulary (id = index),
/// label names (class id = index), maximum length and truncation policy, the calibration temperature already inside
/// the graph, the model id that ties side-car and graph together, and the training profile (kept as raw JSON here;
/// the kit reads it for its drift check). Stored as the side-car JSON and in the graph's metadata_props.
/// </summary>
public sealed record ScoringManifest(
    string ModelId,
    string TokenizerKind,
    bool FoldCase,
    bool LowerCase,
    IReadOnlyList<string> Vocabulary,
    IReadOnlyList<string> Labels,
    int MaxLength,
    string Truncation,
    double Temperature,
    int Opset,
    string? ProfileJson)
{
    public const string Format = "kit-onnx-sidecar";
    public const int FormatVersion = 1;
    /// <summary>metadata_props keys in the ONNX graph.</summary>
    public const string SidecarKey = "kit.sidecar", ModelIdKey = "kit.model_id";
    public const string PadToken = "<pad>", UnknownToken = "<unk>";
    public static readonly string[] TruncationPolicies = { "KeepHead", "KeepTail", "HeadAndTail" };

    /// <summary>The side-car file name for a graph file: "model.onnx" → "model.onnx.json".</summary>
    public static string SidecarPath(string onnxPath) => onnxPath + ".json";

    public string ToJson()
    {
        var root = new JsonObject
        {
            ["format"] = Format,
            ["version"] = FormatVersion,
            ["modelId"] = ModelId,
            ["opset"] = Opset,
            ["inputs"] = new JsonObject { ["tokens"] = "tokens", ["lengths"] = "lengths" },
            ["outputs"] = new JsonObject { ["logits"] = "logits", ["probabilities"] = "probabilities" },
            ["tokenizer"] = new JsonObject { ["kind"] = TokenizerKind, ["foldCase"] = FoldCase, ["lowerCase"] = LowerCase },
            ["labels"] = new JsonArray(Labels.Select(l => (JsonNode?)JsonValue.Create(l)).ToArray()),
            ["maxLength"] = MaxLength,
            ["truncation"] = Truncation,
            ["temperature"] = Temperature,
            ["vocabulary"] = new JsonArray(Vocabulary.Select(t => (JsonNode?)JsonValue.Create(t)).ToArray()),
            ["profile"] = ProfileJson is null ? null : JsonNode.Parse(ProfileJson),
        };
        return root.ToJsonString(new JsonSerializerOptions { WriteIndented = true });
    }

    /// <summary>Reads and checks a side-car; every problem is a <see cref="ScoringModelError"/> naming <paramref name="source"/>.</summary>
    public static ScoringManifest FromJson(string json, string source)
    {
        JsonObject o;
        try
        {
            o = JsonNode.Parse(json) as JsonObject ?? throw new ScoringModelError(source, "the side-car is not one JSON object");
        }
        catch (JsonException e)
        {
            throw new ScoringModelError(source, $"the side-car is not valid JSON (line {(e.LineNumber ?? 0) + 1}): {e.Message}", e);
        }
        try
        {
            if ((string?)o["format"] != Format) throw new ScoringModelError(source, $"not a kit side-car (format is not '{Format}')");
            int version = (int?)o["version"] ?? -1;
            if (version != FormatVersion) throw new ScoringModelError(source, $"side-car version {version} is not supported (this library reads {FormatVersion})");
            var tokenizer = o["tokenizer"] as JsonObject ?? throw new ScoringModelError(source, "side-car has no 'tokenizer'");
            var vocabulary = Strings(o, "vocabulary", source);
            if (vocabulary.Length < 2 || vocabulary[0] != PadToken || vocabulary[1] != UnknownToken)
                throw new ScoringModelError(source, $"the vocabulary must start with '{PadToken}' and '{UnknownToken}'");
            if (vocabulary.Skip(2).Distinct(StringComparer.Ordinal).Count() != vocabulary.Length - 2)
                throw new ScoringModelError(source, "the vocabulary lists a token twice");
            var labels = Strings(o, "labels", source);
            if (labels.Length < 2) throw new ScoringModelError(source, "the side-car needs at least two labels");
            int maxLength = (int?)o["maxLength"] ?? 0;
            if (maxLength < 1) throw new ScoringModelError(source, "maxLength must be at least 1");
            string truncation = (string?)o["truncation"] ?? "";
            if (!TruncationPolicies.Contains(truncation))
                throw new ScoringModelError(source, $"unknown truncation policy '{truncation}' (known: {string.Join(", ", TruncationPolicies)})");
            double temperature = (double?)o["temperature"] ?? 1.0;
            return new ScoringManifest(
                (string?)o["modelId"] ?? throw new ScoringModelError(source, "side-car has no 'modelId'"),
                (string?)tokenizer["kind"] ?? throw new ScoringModelError(source, "tokenizer has no 'kind'"),
                (bool?)tokenizer["foldCase"] ?? false,
                (bool?)tokenizer["lowerCase"] ?? false,
                vocabulary, labels, maxLength, truncation, temperature,
                (int?)o["opset"] ?? 0,
                o["profile"]?.ToJsonString());
        }
        catch (Exception e) when (e is InvalidOperationException or FormatException)
        {
            throw new ScoringModelError(source, $"side-car is malformed: {e.Message}", e);
        }
    }

    static string[] Strings(JsonObject o, string key, string source) =>
        (o[key] as JsonArray ?? throw new ScoringModelError(source, $"side-car has no '{key}' list"))
        .Select(n => (string?)n ?? throw new ScoringModelError(source, $"'{key}' holds a null")).ToArray();
}
