using System.Text.Json;
using System.Text.Json.Serialization;

namespace Kit.Models;

/// <summary>
/// Everything needed to rebuild a <see cref="SequenceClassifier"/>: stored as JSON beside the weights.
/// Dropouts: on embeddings, between stacked layers (inside the Transformer's blocks too), and on the pooled
/// vector before the head. <see cref="Encoder"/> picks the sequence encoder: recurrent (<see cref="Cell"/>),
/// convolutional (<see cref="Widths"/>, <see cref="HiddenSize"/> filters per width) or Transformer
/// (<see cref="HiddenSize"/> model width, <see cref="Heads"/>, <see cref="Positions"/>, <see cref="Layers"/> blocks).
/// Fields added after the first release have defaults, so configs written before them still read.
/// <see cref="Packed"/> runs the cell over packed sequences (exact, usually faster on mixed lengths); when false
/// the cell runs over the padded batch and the kit keeps pads out of every valid step by other means.
/// </summary>
public sealed record ClassifierConfig(
    int VocabularySize,
    int Classes,
    CellKind Cell = CellKind.Gru,
    int EmbeddingSize = 32,
    int HiddenSize = 64,
    int Layers = 1,
    bool Bidirectional = false,
    double EmbeddingDropout = 0,
    double LayerDropout = 0,
    double HeadDropout = 0,
    PoolingKind Pooling = PoolingKind.Last,
    HeadKind Head = HeadKind.Linear,
    int MlpHidden = 64,
    bool Packed = true,
    string Device = ComputeDevice.Cpu,
    EncoderKind Encoder = EncoderKind.Recurrent,
    int Heads = 4,
    PositionKind Positions = PositionKind.Sinusoidal,
    int MaxPositions = 512,
    int[]? Widths = null)
{
    /// <summary>Kernel widths of the convolutional encoder when none are given (character n-grams of 2 to 5).</summary>
    public static readonly IReadOnlyList<int> DefaultWidths = [2, 3, 4, 5];

    /// <summary>The convolutional encoder's kernel widths: <see cref="Widths"/>, or <see cref="DefaultWidths"/>.</summary>
    [JsonIgnore]
    public IReadOnlyList<int> KernelWidths => Widths ?? DefaultWidths;

    /// <summary>Feed-forward width inside a Transformer block: 4 × model width, the ratio of Vaswani et al. (2017).</summary>
    [JsonIgnore]
    public int FeedForwardSize => 4 * HiddenSize;

    [JsonIgnore]
    public int Directions => Bidirectional && Encoder == EncoderKind.Recurrent ? 2 : 1;

    /// <summary>
    /// Width of the per-step outputs and so of the pooled vector: hidden size × directions (recurrent), filters ×
    /// widths (convolutional), model width (Transformer).
    /// </summary>
    [JsonIgnore]
    public int PooledSize => Encoder switch
    {
        EncoderKind.Convolution => HiddenSize * KernelWidths.Count,
        EncoderKind.Transformer => HiddenSize,
        _ => HiddenSize * Directions,
    };

    /// <summary>Gate blocks per cell in the engine's weight layout (one W_ih, W_hh, b_ih, b_hh slice each).</summary>
    [JsonIgnore]
    public int GateCount => Cell switch { CellKind.Gru => 3, CellKind.Lstm => 4, _ => 1 };

    public SequenceClassifier Build() => new(this);

    /// <summary>Throws with every problem found, each naming the field.</summary>
    public ClassifierConfig Validate()
    {
        var problems = new List<string>();
        if (VocabularySize < 2) problems.Add($"VocabularySize must be at least 2 (pad and unknown ids), got {VocabularySize}");
        if (Classes < 2) problems.Add($"Classes must be at least 2, got {Classes}");
        if (EmbeddingSize < 1) problems.Add($"EmbeddingSize must be positive, got {EmbeddingSize}");
        if (HiddenSize < 1) problems.Add($"HiddenSize must be positive, got {HiddenSize}");
        if (Layers < 1) problems.Add($"Layers must be positive, got {Layers}");
        if (MlpHidden < 1) problems.Add($"MlpHidden must be positive, got {MlpHidden}");
        foreach (var (name, p) in new[] { ("EmbeddingDropout", EmbeddingDropout), ("LayerDropout", LayerDropout), ("HeadDropout", HeadDropout) })
            if (!(p >= 0 && p < 1)) problems.Add($"{name} must be in [0, 1), got {p}");
        if (!Enum.IsDefined(Cell)) problems.Add($"Cell {(int)Cell} is not a known cell");
        if (!Enum.IsDefined(Encoder)) problems.Add($"Encoder {(int)Encoder} is not a known encoder");
        if (!Enum.IsDefined(Positions)) problems.Add($"Positions {(int)Positions} is not a known position encoding");
        if (Encoder == EncoderKind.Transformer)
        {
            if (Heads < 1 || HiddenSize % Math.Max(Heads, 1) != 0) problems.Add($"Heads must be positive and divide HiddenSize {HiddenSize}, got {Heads}");
            if (MaxPositions < 1) problems.Add($"MaxPositions must be positive, got {MaxPositions}");
        }
        if (Encoder != EncoderKind.Recurrent && Bidirectional)
            problems.Add($"Bidirectional applies to recurrent encoders only, not {Encoder}");
        if (Widths is { } w && (w.Length == 0 || w.Any(x => x < 1) || w.Distinct().Count() != w.Length))
            problems.Add($"Widths must be distinct positive kernel widths, got [{string.Join(", ", w)}]");
        if (!Enum.IsDefined(Pooling)) problems.Add($"Pooling {(int)Pooling} is not a known pooling");
        if (!Enum.IsDefined(Head)) problems.Add($"Head {(int)Head} is not a known head");
        if (problems.Count > 0) throw new ArgumentException("invalid classifier config: " + string.Join("; ", problems));
        return this;
    }

    /// <summary>
    /// Trainable parameters, counted from the layer shapes without building anything. The engine keeps two bias
    /// vectors per gate block (b_ih and b_hh), as its GRU/LSTM/RNN documentation lists.
    /// </summary>
    public long ParameterCount()
    {
        long h = HiddenSize, g = GateCount, e = EmbeddingSize;
        long total = (long)VocabularySize * EmbeddingSize;
        switch (Encoder)
        {
            case EncoderKind.Convolution:
                foreach (int w in KernelWidths) total += h * e * w + h;
                break;
            case EncoderKind.Transformer:
                long f = FeedForwardSize;
                total += e * h + h;                                        // input projection
                if (Positions == PositionKind.Learned) total += (long)MaxPositions * h;
                total += Layers * (4 * (h * h + h) + 2 * 2 * h + h * f + f + f * h + h);   // attention, 2 norms, feed-forward
                total += 2 * h;                                            // final norm
                break;
            default:
                for (int layer = 0; layer < Layers; layer++)
                {
                    long input = layer == 0 ? EmbeddingSize : h * Directions;
                    total += Directions * g * (h * input + h * h + 2 * h);
                }
                break;
        }
        if (Pooling == PoolingKind.Attention) total += (long)PooledSize * h + h + h;
        total += Head == HeadKind.Linear
            ? (long)PooledSize * Classes + Classes
            : (long)PooledSize * MlpHidden + MlpHidden + (long)MlpHidden * Classes + Classes;
        return total;
    }

    static readonly JsonSerializerOptions Json = new()
    {
        WriteIndented = true,
        Converters = { new JsonStringEnumConverter() },
        UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
    };

    public string ToJson() => JsonSerializer.Serialize(this, Json);

    /// <summary>Reads a config written by <see cref="ToJson"/>; <paramref name="source"/> names the file in errors.</summary>
    public static ClassifierConfig FromJson(string json, string source = "classifier config")
    {
        ClassifierConfig? config;
        try
        {
            config = JsonSerializer.Deserialize<ClassifierConfig>(json, Json);
        }
        catch (JsonException e)
        {
            string where = e.LineNumber is long line ? $" line {line + 1}" : "";
            throw new FormatException($"{source}{where}: {e.Message}", e);
        }
        if (config is null) throw new FormatException($"{source}: empty JSON (null)");
        try
        {
            return config.Validate();
        }
        catch (ArgumentException e)
        {
            throw new FormatException($"{source}: {e.Message}", e);
        }
    }
}
