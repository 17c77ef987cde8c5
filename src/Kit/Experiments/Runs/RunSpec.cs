using Kit.Data;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

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
    public CellKind Cell { get; init; } = CellKind.Gru;
    public int EmbeddingSize { get; init; } = 32;
    public int HiddenSize { get; init; } = 64;
    public int Layers { get; init; } = 1;
    public bool Bidirectional { get; init; }
    public PoolingKind Pooling { get; init; } = PoolingKind.Last;
    public TrainingOptions Training { get; init; } = new();
    /// <summary>Use only this many rows (a stratified sample), for quick runs; null uses all.</summary>
    public int? SampleRows { get; init; }
    /// <summary>How much work the report's diagnostics may do (t-SNE budget, bootstrap, table sizes).</summary>
    public DiagnosticsOptions Diagnostics { get; init; } = new();

    /// <summary>The data-side settings of this run (one holdout split; a sweep adds its folds), as <see cref="PreparedData.Prepare(LabelledTable, PrepareOptions)"/> takes them.</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public PrepareOptions Preparation => new()
    {
        Tokenizer = Tokenizer, FoldCase = FoldCase, MaxLength = MaxLength, Truncation = Truncation, MinTokenCount = MinTokenCount,
        TrainFraction = TrainFraction, ValidationFraction = ValidationFraction, TestFraction = TestFraction, GroupAware = GroupAware,
        SplitSeed = SplitSeed, SampleRows = SampleRows,
    };

    public ITokenizer CreateTokenizer() => Preparation.CreateTokenizer();
}
