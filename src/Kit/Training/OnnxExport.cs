using System.Globalization;
using System.Security.Cryptography;
using System.Text.Json;
using System.Text.Json.Nodes;
using Kit.Common;
using Kit.Models.Onnx;

namespace Kit.Training;

/// <summary>What <see cref="OnnxExport.Write"/> wrote.</summary>
public sealed record OnnxExportResult(string OnnxPath, string SidecarPath, string ModelId, long Bytes);

/// <summary>
/// A model bundle as an ONNX file plus its side-car JSON ("model.onnx" → "model.onnx.json"): the graph from
/// <see cref="ClassifierGraph"/> (temperature folded in), and the tokenizer, vocabulary, labels, maximum length,
/// truncation policy and training profile beside it. The side-car is also embedded in the graph's metadata_props,
/// so the .onnx file alone is enough for the scoring library. The model id (SHA-256 of the graph without its
/// metadata) ties the two together: a side-car from another export is refused.
/// Lives in Training because it reads a <see cref="ModelBundle"/>; the graph itself is built in Models/Onnx,
/// next to the modules whose weights it reads.
/// </summary>
public static class OnnxExport
{
    public const string SidecarFormat = "kit-onnx-sidecar";
    public const int SidecarVersion = 1;
    public const string SidecarKey = "kit.sidecar", ModelIdKey = "kit.model_id", VocabularySizeKey = "kit.vocabulary_size";

    public static string SidecarPath(string onnxPath) => onnxPath + ".json";

    public static OnnxExportResult Write(ModelBundle bundle, string onnxPath, int opset = ClassifierGraph.Opset)
    {
        var (model, sidecar, id) = Build(bundle, opset);
        string sidecarPath = SidecarPath(onnxPath);
        AtomicFile.WriteAllBytes(onnxPath, model);
        AtomicFile.WriteAllText(sidecarPath, sidecar);
        return new OnnxExportResult(onnxPath, sidecarPath, id, model.LongLength);
    }

    /// <summary>The ONNX bytes (with metadata), the side-car JSON and the model id.</summary>
    public static (byte[] Model, string Sidecar, string ModelId) Build(ModelBundle bundle, int opset = ClassifierGraph.Opset)
    {
        if (bundle.Tokenizer.Kind == Kit.Data.TokenizerSpec.Delegate)
            throw new NotSupportedException($"tokenizer '{bundle.Tokenizer.Name}' is a user function; an exported model can carry only the character, word or byte tokenizer");
        double temperature = bundle.Temperature ?? 1.0;
        var graph = ClassifierGraph.Build(bundle.Model, temperature, Array.Empty<KeyValuePair<string, string>>(), opset: opset, positionRows: bundle.MaxLength);
        string id = Convert.ToHexStringLower(SHA256.HashData(graph));
        string sidecar = Sidecar(bundle, id, temperature, opset);
        // A ModelProto is a sequence of fields, so metadata_props entries can follow the rest of the message.
        var metadata = new[]
        {
            KeyValuePair.Create(ModelIdKey, id),
            KeyValuePair.Create(VocabularySizeKey, bundle.Vocabulary.Count.ToString(CultureInfo.InvariantCulture)),
            KeyValuePair.Create(SidecarKey, sidecar),
        };
        var tail = new ProtoWriter();
        foreach (var (key, value) in metadata)
            tail.Message(OnnxFields.ModelMetadataProps, e => e.String(OnnxFields.EntryKey, key).String(OnnxFields.EntryValue, value));
        return ([.. graph, .. tail.ToArray()], sidecar, id);
    }

    static string Sidecar(ModelBundle bundle, string id, double temperature, int opset)
    {
        var t = bundle.Tokenizer;
        var root = new JsonObject
        {
            ["format"] = SidecarFormat,
            ["version"] = SidecarVersion,
            ["modelId"] = id,
            ["opset"] = opset,
            ["inputs"] = new JsonObject { ["tokens"] = ClassifierGraph.TokensInput, ["lengths"] = ClassifierGraph.LengthsInput },
            ["outputs"] = new JsonObject { ["logits"] = ClassifierGraph.LogitsOutput, ["probabilities"] = ClassifierGraph.ProbabilitiesOutput },
            ["tokenizer"] = new JsonObject { ["kind"] = t.Kind, ["foldCase"] = t.FoldCase, ["lowerCase"] = t.LowerCase },
            ["labels"] = new JsonArray(bundle.Labels.Names.Select(n => (JsonNode?)JsonValue.Create(n)).ToArray()),
            ["maxLength"] = bundle.MaxLength,
            ["truncation"] = bundle.Truncation.ToString(),
            ["temperature"] = temperature,
            ["vocabulary"] = new JsonArray(bundle.Vocabulary.Tokens.Select(s => (JsonNode?)JsonValue.Create(s)).ToArray()),
            ["profile"] = bundle.Profile is null ? null : JsonNode.Parse(bundle.Profile.ToJson()),
        };
        return root.ToJsonString(new JsonSerializerOptions { WriteIndented = true });
    }
}
