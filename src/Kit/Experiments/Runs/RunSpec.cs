using Kit.Data;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// Everything that defines one train-and-evaluate run: data, tokenisation, split, model, training. The data-side
/// settings live in <see cref="Preparation"/> (their defaults are defined there, once); the flat properties below
/// read and write it, so <c>new RunSpec { MaxLength = 40 }</c> and <c>spec with { SampleRows = 3000 }</c> work.
/// </summary>
public sealed record RunSpec
{
    public required string DataPath { get; init; }
    public ColumnSpec Columns { get; init; } = new();

    /// <summary>The data-side settings of this run (one holdout split; a sweep adds its folds), as <see cref="PreparedData.Prepare(LabelledTable, PrepareOptions)"/> takes them.</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public PrepareOptions Preparation { get; init; } = new();

    public TokenizerKind Tokenizer { get => Preparation.Tokenizer; init => Preparation = Preparation with { Tokenizer = value }; }
    public bool FoldCase { get => Preparation.FoldCase; init => Preparation = Preparation with { FoldCase = value }; }
    public int MaxLength { get => Preparation.MaxLength; init => Preparation = Preparation with { MaxLength = value }; }
    public TruncationPolicy Truncation { get => Preparation.Truncation; init => Preparation = Preparation with { Truncation = value }; }
    public int MinTokenCount { get => Preparation.MinTokenCount; init => Preparation = Preparation with { MinTokenCount = value }; }
    public double TrainFraction { get => Preparation.TrainFraction; init => Preparation = Preparation with { TrainFraction = value }; }
    public double ValidationFraction { get => Preparation.ValidationFraction; init => Preparation = Preparation with { ValidationFraction = value }; }
    public double TestFraction { get => Preparation.TestFraction; init => Preparation = Preparation with { TestFraction = value }; }
    /// <summary>Keep every group in one part (needs a group column); otherwise a stratified holdout.</summary>
    public bool GroupAware { get => Preparation.GroupAware; init => Preparation = Preparation with { GroupAware = value }; }
    public ulong SplitSeed { get => Preparation.SplitSeed; init => Preparation = Preparation with { SplitSeed = value }; }
    /// <summary>Use only this many rows (a stratified sample), for quick runs; null uses all.</summary>
    public int? SampleRows { get => Preparation.SampleRows; init => Preparation = Preparation with { SampleRows = value }; }

    /// <summary>Encoder family; <see cref="Cell"/> says which recurrent cell when it is <see cref="EncoderKind.Recurrent"/>.</summary>
    public EncoderKind Encoder { get; init; } = EncoderKind.Recurrent;
    public CellKind Cell { get; init; } = CellKind.Gru;
    public int EmbeddingSize { get; init; } = 32;
    public int HiddenSize { get; init; } = 64;
    public int Layers { get; init; } = 1;
    public bool Bidirectional { get; init; }
    public PoolingKind Pooling { get; init; } = PoolingKind.Last;
    /// <summary>Dropout rate on the embeddings, between layers and before the head, unless one of those is set on its own.</summary>
    public double Dropout { get; init; }
    public double? EmbeddingDropout { get; init; }
    public double? LayerDropout { get; init; }
    public double? HeadDropout { get; init; }
    /// <summary>Attention heads of the Transformer encoder (must divide the hidden size).</summary>
    public int Heads { get; init; } = 4;
    public PositionKind Positions { get; init; } = PositionKind.Sinusoidal;
    public TrainingOptions Training { get; init; } = new();
    /// <summary>How much work the report's diagnostics may do (t-SNE budget, bootstrap, table sizes).</summary>
    public DiagnosticsOptions Diagnostics { get; init; } = new();

    public ITokenizer CreateTokenizer() => Preparation.CreateTokenizer();

    /// <summary>The model config this spec asks for, for a vocabulary and label set of the given sizes.</summary>
    public ClassifierConfig ModelConfig(int vocabularySize, int classes) => new(
        vocabularySize, classes, Cell, EmbeddingSize, HiddenSize, Layers, Encoder == EncoderKind.Recurrent && Bidirectional,
        EmbeddingDropout ?? Dropout, LayerDropout ?? Dropout, HeadDropout ?? Dropout, Pooling,
        Encoder: Encoder, Heads: Heads, Positions: Positions, MaxPositions: Math.Max(MaxLength, 1));

    /// <summary>How the spec's encoder is named in settings and reports: gru, lstm, rnn, cnn or transformer.</summary>
    public string EncoderName => Encoder switch
    {
        EncoderKind.Convolution => "cnn",
        EncoderKind.Transformer => "transformer",
        _ => Cell.ToString().ToLowerInvariant(),
    };
}
