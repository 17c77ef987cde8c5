using System.Text.Json.Nodes;
using Kit.Common;
using Kit.Data;
using Kit.Models;

namespace Kit.Training;

/// <summary>
/// A trained classifier in one file: weights, model config, tokenizer, vocabulary, label map, maximum length and
/// truncation policy, calibration temperature (null until fitted), and the training seed — everything needed to
/// score new text exactly as the training run encoded it. Stored in the <see cref="KitContainer"/> layout with
/// magic "KITMODEL"; the bytes depend only on the content, so equal models give equal files.
/// </summary>
public sealed class ModelBundle
{
    public const string Magic = "KITMODEL";
    public const string DefaultFileName = "model.kitmodel";
    const string What = "kit model bundle";

    public required SequenceClassifier Model { get; init; }
    public required TokenizerSpec Tokenizer { get; init; }
    public required Vocabulary Vocabulary { get; init; }
    public required LabelMap Labels { get; init; }
    public required int MaxLength { get; init; }
    public TruncationPolicy Truncation { get; init; } = TruncationPolicy.KeepHead;
    /// <summary>Softmax temperature fitted on validation logits (temperature scaling); null = not calibrated (T = 1).</summary>
    public double? Temperature { get; init; }
    public ulong TrainingSeed { get; init; }
    /// <summary>What the training data looked like, for the drift check at score time; null in bundles written before it existed.</summary>
    public TrainingProfile? Profile { get; init; }
    public ClassifierConfig Config => Model.Config;

    /// <summary>The same bundle with a calibration temperature (the diagnostics layer fits it).</summary>
    public ModelBundle WithTemperature(double? temperature)
    {
        if (temperature is double t && !(t > 0 && double.IsFinite(t)))
            throw new ArgumentOutOfRangeException(nameof(temperature), t, "temperature must be positive and finite");
        return new ModelBundle
        {
            Model = Model, Tokenizer = Tokenizer, Vocabulary = Vocabulary, Labels = Labels, MaxLength = MaxLength,
            Truncation = Truncation, Temperature = temperature, TrainingSeed = TrainingSeed, Profile = Profile,
        };
    }

    public byte[] ToBytes()
    {
        if (Config.VocabularySize != Vocabulary.Count)
            throw new InvalidOperationException($"model expects {Config.VocabularySize} token ids but the vocabulary has {Vocabulary.Count}");
        if (Config.Classes != Labels.Count)
            throw new InvalidOperationException($"model has {Config.Classes} outputs but the label map has {Labels.Count} classes");
        var manifest = new JsonObject
        {
            ["kind"] = "kit-model",
            ["config"] = JsonNode.Parse(Config.ToJson()),
            ["tokenizer"] = JsonNode.Parse(Tokenizer.ToJson()),
            ["vocabulary"] = JsonNode.Parse(Vocabulary.ToJson()),
            ["labels"] = new JsonArray(Labels.Names.Select(n => (JsonNode?)JsonValue.Create(n)).ToArray()),
            ["maxLength"] = MaxLength,
            ["truncation"] = Truncation.ToString(),
            ["temperature"] = Temperature,
            ["trainingSeed"] = TrainingSeed,
        };
        if (Profile is not null) manifest["profile"] = JsonNode.Parse(Profile.ToJson());
        return KitContainer.Write(Magic, manifest, new[] { ("weights", TensorArchive.Write(Model.state_dict())) });
    }

    /// <summary>Writes atomically: a reader never sees half a bundle.</summary>
    public void Save(string path) => AtomicFile.WriteAllBytes(path, ToBytes());

    public static ModelBundle Load(string path) => FromBytes(KitContainer.ReadFile(path), path);

    public static ModelBundle FromBytes(byte[] bytes, string source)
    {
        var (m, sections) = KitContainer.Read(bytes, source, Magic, What,
            new Dictionary<string, string> { [TrainingCheckpoint.Magic] = "kit training checkpoint", ["KITNGRAM"] = "kit n-gram baseline" });
        if ((string?)m["kind"] != "kit-model") throw new BundleError(source, "manifest kind is not 'kit-model'");
        try
        {
            var config = ClassifierConfig.FromJson(Need(m, "config", source).ToJsonString(), source + " (config)");
            var tokenizer = TokenizerSpec.FromJson(Need(m, "tokenizer", source).ToJsonString());
            var vocabulary = Vocabulary.FromJson(Need(m, "vocabulary", source).ToJsonString());
            var names = Need(m, "labels", source).AsArray().Select(n => (string?)n ?? throw new BundleError(source, "a label name is null")).ToArray();
            var labels = new LabelMap(names);
            if (!labels.Names.SequenceEqual(names, StringComparer.Ordinal))
                throw new BundleError(source, "label names are not distinct and in ordinal order, so class ids would not match the weights");
            if (config.VocabularySize != vocabulary.Count)
                throw new BundleError(source, $"config expects {config.VocabularySize} token ids but the vocabulary has {vocabulary.Count}");
            if (config.Classes != labels.Count)
                throw new BundleError(source, $"config has {config.Classes} classes but the label map has {labels.Count}");
            int maxLength = (int?)m["maxLength"] ?? throw new BundleError(source, "manifest has no maxLength");
            if (maxLength < 1) throw new BundleError(source, $"maxLength {maxLength} must be at least 1");
            var truncation = Enum.Parse<TruncationPolicy>((string?)m["truncation"] ?? nameof(TruncationPolicy.KeepHead));
            double? temperature = (double?)m["temperature"];
            if (temperature is double t && !(t > 0 && double.IsFinite(t))) throw new BundleError(source, $"temperature {t} must be positive");
            var profile = m["profile"] is JsonNode p ? TrainingProfile.FromJson(p.ToJsonString(), source + " (profile)") : null;
            if (!sections.TryGetValue("weights", out var weightBytes)) throw new BundleError(source, "no 'weights' section");

            Kit.Native.Engine.EnsureLoaded();
            var model = config.Build();
            var weights = TensorArchive.Read(weightBytes, source, "weights");
            try
            {
                TensorArchive.LoadInto(model, weights, source);
            }
            finally
            {
                foreach (var w in weights.Values) w.Dispose();
            }
            model.eval();
            return new ModelBundle
            {
                Model = model, Tokenizer = tokenizer, Vocabulary = vocabulary, Labels = labels, MaxLength = maxLength,
                Truncation = truncation, Temperature = temperature, TrainingSeed = (ulong?)m["trainingSeed"] ?? 0, Profile = profile,
            };
        }
        catch (Exception e) when (e is FormatException or InvalidDataException or DataError or InvalidOperationException or ArgumentException)
        {
            throw new BundleError(source, $"manifest is malformed: {e.Message}", e);
        }
    }

    static JsonNode Need(JsonObject m, string key, string source) => m[key] ?? throw new BundleError(source, $"manifest has no '{key}'");
}
