using System.Globalization;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// One point of a sweep: settings applied on top of the sweep's base <see cref="RunSpec"/>, or one of the two n-gram
/// baselines (naive Bayes, logistic regression). The name ("cell=gru;embed=16") is the config's identity in the results store, so it is built
/// in a fixed key order and never depends on how the grid was typed.
/// </summary>
public sealed record SweepConfig
{
    public const string BaselineName = "naive-bayes";
    public const string LinearBaselineName = "logistic-regression";

    /// <summary>Setting keys in the order names are written, with what each accepts.</summary>
    public static readonly IReadOnlyList<(string Key, string Accepts)> Keys =
    [
        ("cell", "gru, lstm or rnn"),
        ("encoder", "gru, lstm, rnn, cnn or transformer"),
        ("embed", "a positive integer (embedding size)"),
        ("hidden", "a positive integer (hidden size)"),
        ("layers", "a positive integer"),
        ("bidirectional", "true or false"),
        ("pooling", "last, mean, max or attention"),
        ("heads", "a positive integer (Transformer attention heads, dividing hidden)"),
        ("positions", "sinusoidal or learned (Transformer positions)"),
        ("dropout", "a rate in [0, 1) on embeddings, between layers and before the head"),
        ("embed-dropout", "a rate in [0, 1) on the embeddings"),
        ("layer-dropout", "a rate in [0, 1) between layers"),
        ("head-dropout", "a rate in [0, 1) before the head"),
        ("epochs", "a positive integer"),
        ("batch", "a positive integer (batch size)"),
        ("lr", "a positive number (learning rate)"),
    ];

    public string Name { get; }
    public IReadOnlyDictionary<string, string> Settings { get; }
    public bool IsBaseline { get; }

    SweepConfig(IReadOnlyDictionary<string, string> settings, bool baseline, string? baselineName = null)
    {
        Settings = settings;
        IsBaseline = baseline;
        Name = baseline ? baselineName ?? BaselineName
            : settings.Count == 0 ? "base"
            : string.Join(";", Keys.Where(k => settings.ContainsKey(k.Key)).Select(k => $"{k.Key}={settings[k.Key]}"));
    }

    /// <summary>The n-gram naive Bayes baseline.</summary>
    public static SweepConfig Baseline { get; } = new(new Dictionary<string, string>(), baseline: true);

    /// <summary>The tf-idf n-gram logistic regression baseline.</summary>
    public static SweepConfig LinearBaseline { get; } = new(new Dictionary<string, string>(), baseline: true, LinearBaselineName);

    /// <summary>Both baselines, which every comparison carries.</summary>
    public static IReadOnlyList<SweepConfig> Baselines { get; } = [Baseline, LinearBaseline];

    /// <summary>Which baseline this config is (only for baselines).</summary>
    public BaselineKind BaselineKind => Name == LinearBaselineName ? BaselineKind.LogisticRegression : BaselineKind.NaiveBayes;

    /// <summary>A neural config from key/value pairs; each value is checked here, so a typo fails before any run.</summary>
    public static SweepConfig Of(params (string Key, string Value)[] settings)
    {
        var map = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var (rawKey, rawValue) in settings)
        {
            string key = rawKey.Trim().ToLowerInvariant(), value = rawValue.Trim().ToLowerInvariant();
            var known = Keys.FirstOrDefault(k => k.Key == key);
            if (known.Key is null)
                throw new ArgumentException($"unknown sweep setting '{rawKey}'; known: {string.Join(", ", Keys.Select(k => k.Key))}");
            if (!map.TryAdd(key, value)) throw new ArgumentException($"sweep setting '{key}' given twice in one config");
            try { Apply(new RunSpec { DataPath = "" }, key, value); }
            catch (FormatException) { throw new ArgumentException($"sweep setting {key}={rawValue}: expected {known.Accepts}"); }
        }
        return new SweepConfig(map, baseline: false);
    }

    /// <summary>The run spec of this config: the base with this config's settings applied.</summary>
    public RunSpec Apply(RunSpec baseSpec)
    {
        if (IsBaseline) return baseSpec;
        var spec = baseSpec;
        foreach (var key in Keys.Select(k => k.Key).Where(Settings.ContainsKey)) spec = Apply(spec, key, Settings[key]);
        return spec;
    }

    static RunSpec Apply(RunSpec s, string key, string value) => key switch
    {
        "cell" => s with { Cell = value switch { "gru" => CellKind.Gru, "lstm" => CellKind.Lstm, "rnn" => CellKind.Rnn, _ => throw new FormatException() } },
        "encoder" => value switch
        {
            "cnn" => s with { Encoder = EncoderKind.Convolution },
            "transformer" => s with { Encoder = EncoderKind.Transformer },
            _ => Apply(s, "cell", value) with { Encoder = EncoderKind.Recurrent },
        },
        "heads" => s with { Heads = Positive(value) },
        "positions" => s with { Positions = value switch { "sinusoidal" => PositionKind.Sinusoidal, "learned" => PositionKind.Learned, _ => throw new FormatException() } },
        "dropout" => s with { Dropout = Rate(value) },
        "embed-dropout" => s with { EmbeddingDropout = Rate(value) },
        "layer-dropout" => s with { LayerDropout = Rate(value) },
        "head-dropout" => s with { HeadDropout = Rate(value) },
        "embed" => s with { EmbeddingSize = Positive(value) },
        "hidden" => s with { HiddenSize = Positive(value) },
        "layers" => s with { Layers = Positive(value) },
        "bidirectional" => s with { Bidirectional = value switch { "true" => true, "false" => false, _ => throw new FormatException() } },
        "pooling" => s with
        {
            Pooling = value switch
            {
                "last" => PoolingKind.Last, "mean" => PoolingKind.Mean, "max" => PoolingKind.Max, "attention" => PoolingKind.Attention,
                _ => throw new FormatException(),
            },
        },
        "epochs" => s with { Training = s.Training with { Epochs = Positive(value) } },
        "batch" => s with { Training = s.Training with { BatchSize = Positive(value) } },
        "lr" => s with { Training = s.Training with { LearningRate = PositiveNumber(value) } },
        _ => throw new ArgumentException($"unknown sweep setting '{key}'"),
    };

    static int Positive(string v) => int.TryParse(v, NumberStyles.None, CultureInfo.InvariantCulture, out int n) && n > 0 ? n : throw new FormatException();

    internal static double Rate(string v) =>
        double.TryParse(v, NumberStyles.Float, CultureInfo.InvariantCulture, out double x) && x >= 0 && x < 1 ? x : throw new FormatException();

    static double PositiveNumber(string v) =>
        double.TryParse(v, NumberStyles.Float, CultureInfo.InvariantCulture, out double x) && x > 0 && double.IsFinite(x) ? x : throw new FormatException();

    public override string ToString() => Name;
}
