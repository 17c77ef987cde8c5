namespace Kit.Data;

/// <summary>
/// How labelled rows become a <see cref="PreparedData"/>: which rows (a sample or all), how they are split, how
/// text becomes tokens, how long a sequence may be and which tokens the vocabulary keeps. Every front end (the
/// notebook, <c>kit inspect</c>, <c>kit train</c>, <c>kit compare</c>) prepares through these, so the split a user
/// audits is the split that is trained on.
/// </summary>
public sealed record PrepareOptions
{
    public TokenizerKind Tokenizer { get; init; } = TokenizerKind.Character;
    /// <summary>Fold case before splitting characters (character tokenizer only).</summary>
    public bool FoldCase { get; init; }
    public int MaxLength { get; init; } = 64;
    public TruncationPolicy Truncation { get; init; } = TruncationPolicy.KeepHead;
    /// <summary>Tokens seen fewer times than this in the training part map to the unknown id.</summary>
    public int MinTokenCount { get; init; } = 1;
    public double TrainFraction { get; init; } = 0.7;
    public double ValidationFraction { get; init; } = 0.15;
    public double TestFraction { get; init; } = 0.15;
    /// <summary>Keep every group in one part when the table has a group column; otherwise a stratified split.</summary>
    public bool GroupAware { get; init; } = true;
    public ulong SplitSeed { get; init; } = 17;
    /// <summary>Use only this many rows (a class-stratified, seeded sample); null uses all.</summary>
    public int? SampleRows { get; init; }
    /// <summary>k for k-fold splits (a validation share is carved from each fold's training part); null is one holdout split.</summary>
    public int? Folds { get; init; }

    public ITokenizer CreateTokenizer() => Tokenizer switch
    {
        TokenizerKind.Character => new CharacterTokenizer(FoldCase),
        TokenizerKind.Byte => new ByteTokenizer(),
        TokenizerKind.Word => new WordTokenizer(lowerCase: true),
        _ => throw new ArgumentOutOfRangeException(nameof(Tokenizer)),
    };

    /// <summary>Throws one <see cref="ArgumentException"/> naming every setting that is out of range.</summary>
    public PrepareOptions Validate()
    {
        var problems = new List<string>();
        if (MaxLength < 1) problems.Add($"max length must be at least 1, got {MaxLength}");
        if (MinTokenCount < 1) problems.Add($"minimum token count must be at least 1, got {MinTokenCount}");
        double[] f = [TrainFraction, ValidationFraction, TestFraction];
        if (f.Any(x => !(x >= 0))) problems.Add("split fractions must be non-negative");
        else if (Math.Abs(f.Sum() - 1) > 1e-9) problems.Add($"split fractions must add up to 1 (they add up to {f.Sum():0.###})");
        if (!(TrainFraction > 0)) problems.Add("the training fraction must be positive");
        if (SampleRows is int n && n < 1) problems.Add($"sample must be at least 1 row, got {n}");
        if (Folds is int k && k < 2) problems.Add($"folds = {k}; k-fold needs k ≥ 2 (leave folds unset for one holdout split)");
        if (problems.Count > 0) throw new ArgumentException(string.Join("; ", problems));
        return this;
    }
}
