using Kit.Data;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

public enum TokenizerKind { Character, Byte, Word }

/// <summary>Everything that defines one train-and-evaluate run: data, tokenisation, split, model, training.</summary>
public sealed record RunSpec
{
    public required string DataPath { get; init; }
    public ColumnSpec Columns { get; init; } = new();
    public TokenizerKind Tokenizer { get; init; } = TokenizerKind.Character;
    public bool FoldCase { get; init; }
    public int MaxLength { get; init; } = 64;
    public TruncationPolicy Truncation { get; init; } = TruncationPolicy.KeepHead;
    public int MinTokenCount { get; init; } = 1;
    public double TrainFraction { get; init; } = 0.7;
    public double ValidationFraction { get; init; } = 0.15;
    public double TestFraction { get; init; } = 0.15;
    /// <summary>Keep every group in one part (needs a group column); otherwise a stratified holdout.</summary>
    public bool GroupAware { get; init; } = true;
    public ulong SplitSeed { get; init; } = 17;
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
    /// <summary>Use only this many rows (a stratified sample), for quick runs; null uses all.</summary>
    public int? SampleRows { get; init; }
    /// <summary>How much work the report's diagnostics may do (t-SNE budget, bootstrap, table sizes).</summary>
    public DiagnosticsOptions Diagnostics { get; init; } = new();

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

    public ITokenizer CreateTokenizer() => Tokenizer switch
    {
        TokenizerKind.Character => new CharacterTokenizer(FoldCase),
        TokenizerKind.Byte => new ByteTokenizer(),
        TokenizerKind.Word => new WordTokenizer(lowerCase: true),
        _ => throw new ArgumentOutOfRangeException(nameof(Tokenizer)),
    };
}
