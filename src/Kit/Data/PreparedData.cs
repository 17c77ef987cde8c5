using Kit.Common;

namespace Kit.Data;

/// <summary>
/// Labelled rows made ready to train on, built once by <see cref="Prepare"/>: the rows in play (a sample or all),
/// their label ids, their tokens and token lengths, and the split (one holdout, k folds, or the table's own split
/// column). Each fold's vocabulary comes from that fold's training part only (<see cref="Fold"/>).
///
/// Positions: every index this type hands out (split parts, <see cref="LabelIds"/>, <see cref="Lengths"/>) is a
/// position among <see cref="Rows"/>; <see cref="TableRow"/> turns one back into a row of <see cref="Table"/>, and
/// encoded sets carry table rows as their source rows. This is the only place that converts between the two.
/// </summary>
public sealed class PreparedData
{
    readonly PreparedFold?[] _folds;
    readonly Lazy<DatasetProfile> _profile;
    readonly Lazy<LabelledTable> _used;

    public LabelledTable Table { get; }
    public PrepareOptions Options { get; }
    /// <summary>Table rows in play, ascending; split parts index positions in this array.</summary>
    public int[] Rows { get; }
    public LabelMap Labels { get; }
    /// <summary>Class id of each position.</summary>
    public int[] LabelIds { get; }
    public ITokenizer Tokenizer { get; }
    /// <summary>Tokens of each position, before truncation.</summary>
    public IReadOnlyList<IReadOnlyList<string>> Pieces { get; }
    /// <summary>Token count of each position, before truncation.</summary>
    public int[] Lengths { get; }
    /// <summary>One split for a holdout or a split column; k for k-fold (fold f is Splits[f − 1]).</summary>
    public IReadOnlyList<Split> Splits { get; }
    /// <summary>How the parts were cut, in words (e.g. "group holdout 0.7/0.15/0.15, seed 17").</summary>
    public string SplitDescription { get; }

    public int Count => Rows.Length;
    public int FoldCount => Splits.Count;
    /// <summary>The rows in play as a table of their own (positions are its rows), keeping source lines.</summary>
    public LabelledTable UsedTable => _used.Value;
    /// <summary>Classes, lengths and token coverage of the rows in play.</summary>
    public DatasetProfile Profile => _profile.Value;

    PreparedData(LabelledTable table, PrepareOptions options, int[] rows, LabelMap labels, int[] labelIds, ITokenizer tokenizer,
        IReadOnlyList<string>[] pieces, IReadOnlyList<Split> splits, string description)
    {
        Table = table;
        Options = options;
        Rows = rows;
        Labels = labels;
        LabelIds = labelIds;
        Tokenizer = tokenizer;
        Pieces = pieces;
        Lengths = pieces.Select(p => p.Count).ToArray();
        Splits = splits;
        SplitDescription = description;
        _folds = new PreparedFold?[splits.Count];
        _used = new Lazy<LabelledTable>(() => rows.Length == table.Count ? table : table.Subset(rows));
        _profile = new Lazy<DatasetProfile>(() => DatasetProfile.Compute(UsedTable, tokenizer.Name, pieces));
    }

    /// <summary>Reads <paramref name="path"/> and prepares it (see <see cref="Prepare(LabelledTable, PrepareOptions)"/>).</summary>
    public static PreparedData Prepare(string path, ColumnSpec columns, PrepareOptions options, RowPolicy policy = RowPolicy.Refuse) =>
        Prepare(TableReader.Read(path, columns, policy), options);

    /// <summary>
    /// Samples, tokenizes and splits <paramref name="table"/>. The split is the table's split column when it has one,
    /// otherwise group-aware when <see cref="PrepareOptions.GroupAware"/> and the table has groups, otherwise
    /// stratified by class; a holdout, or k folds when <see cref="PrepareOptions.Folds"/> is set.
    /// </summary>
    public static PreparedData Prepare(LabelledTable table, PrepareOptions options)
    {
        ArgumentNullException.ThrowIfNull(table);
        options = (options ?? new PrepareOptions()).Validate();
        if (table.Count == 0) throw new DataError(table.SourcePath, 0, "the file has no usable rows");
        var labels = table.LabelMap();
        int[] allIds = table.LabelIds(labels);
        int[] rows = options.SampleRows is int n && n < table.Count
            ? StratifiedSample(allIds, n, options.SplitSeed)
            : Enumerable.Range(0, table.Count).ToArray();
        int[] y = rows.Select(r => allIds[r]).ToArray();
        var tokenizer = options.CreateTokenizer();
        var pieces = rows.Select(r => tokenizer.Split(table.Texts[r])).ToArray();
        int[] lengths = pieces.Select(p => p.Count).ToArray();
        string[]? groups = options.GroupAware && table.Groups is not null ? rows.Select(r => table.Groups[r]).ToArray() : null;
        string fractions = FormattableString.Invariant($"{options.TrainFraction:0.###}/{options.ValidationFraction:0.###}/{options.TestFraction:0.###}");

        IReadOnlyList<Split> splits;
        string description;
        if (table.Splits is not null)
        {
            if (options.Folds is not null)
                throw new ArgumentException("the table carries its own split column; k-fold runs cannot use it (drop the split column or the folds)");
            splits = [Splitter.FromColumn(rows.Select(r => table.Splits[r]).ToArray(), y, lengths)];
            description = "given by the split column";
        }
        else if (options.Folds is int k)
        {
            // The validation share of each fold's training part matches the holdout's train : validation ratio.
            double validation = options.ValidationFraction / (options.TrainFraction + options.ValidationFraction);
            splits = groups is not null
                ? Splitter.FoldsByGroup(y, groups, k, options.SplitSeed, validation, lengths)
                : Splitter.FoldsByClass(y, k, options.SplitSeed, validation, lengths);
            description = FormattableString.Invariant($"{(groups is not null ? "group" : "stratified")} {k}-fold, validation {validation:0.###} of each training part, seed {options.SplitSeed}");
        }
        else
        {
            splits = [groups is not null
                ? Splitter.GroupHoldout(y, groups, options.TrainFraction, options.ValidationFraction, options.TestFraction, options.SplitSeed, lengths)
                : Splitter.StratifiedHoldout(y, options.TrainFraction, options.ValidationFraction, options.TestFraction, options.SplitSeed, lengths)];
            description = $"{(groups is not null ? "group" : "stratified")} holdout {fractions}, seed {options.SplitSeed}";
        }
        if (rows.Length < table.Count) description += $"; a class-stratified sample of {rows.Length} of {table.Count} rows";
        return new PreparedData(table, options, rows, labels, y, tokenizer, pieces, splits, description);
    }

    /// <summary>The table row at <paramref name="position"/>.</summary>
    public int TableRow(int position) => Rows[position];

    /// <summary>Table rows of the given positions.</summary>
    public int[] TableRows(IEnumerable<int> positions) => positions.Select(p => Rows[p]).ToArray();

    /// <summary>Text at <paramref name="position"/>.</summary>
    public string Text(int position) => Table.Texts[Rows[position]];

    /// <summary>Fold <paramref name="number"/> (1-based; a holdout has fold 1): its vocabulary, encoded parts and audit.</summary>
    public PreparedFold Fold(int number = 1)
    {
        if (number < 1 || number > Splits.Count)
            throw new ArgumentOutOfRangeException(nameof(number), $"fold {number} does not exist; this data has {Splits.Count} fold(s)");
        lock (_folds)
            return _folds[number - 1] ??= new PreparedFold(this, number, Splits[number - 1]);
    }

    /// <summary>A class-stratified, seeded sample of about <paramref name="n"/> indices (every class keeps ≥ 1), ascending.</summary>
    public static int[] StratifiedSample(int[] labels, int n, ulong seed)
    {
        double fraction = n / (double)labels.Length;
        var rng = new SplitMix64(seed);
        var picked = new List<int>();
        foreach (var cls in labels.Distinct().OrderBy(c => c))
        {
            var members = Enumerable.Range(0, labels.Length).Where(i => labels[i] == cls).ToArray();
            rng.Shuffle(members.AsSpan());
            int take = Math.Max(1, (int)Math.Round(members.Length * fraction));
            picked.AddRange(members.Take(take));
        }
        picked.Sort();
        return picked.ToArray();
    }

    public override string ToString() =>
        $"{Path.GetFileName(Table.SourcePath)}: {Count} rows, {Labels.Count} classes, {Tokenizer.Name} tokens; {SplitDescription}";
}

/// <summary>
/// One fold of a <see cref="PreparedData"/> (the only fold of a holdout): the vocabulary of its training part, every
/// row encoded under it and cut to the maximum length, the three encoded parts, and what the split and the audit
/// found. Encoded sets carry table rows as their source rows.
/// </summary>
public sealed class PreparedFold
{
    readonly Lazy<LeakageReport> _leakage;
    readonly Lazy<IReadOnlyList<VocabularyCoverage>> _coverage;

    public PreparedData Data { get; }
    public int Number { get; }
    public Split Split { get; }
    /// <summary>Part sizes, class counts and token lengths; carries the class names so it can be shown alone.</summary>
    public SplitSummary Summary { get; }
    public Vocabulary Vocabulary { get; }
    /// <summary>Every position encoded, in position order.</summary>
    public EncodedSet All { get; }
    public EncodedSet Train { get; }
    public EncodedSet Validation { get; }
    public EncodedSet Test { get; }
    public TruncationReport Truncation { get; }
    /// <summary>Duplicates, near-duplicates, label conflicts and groups across the parts of this fold.</summary>
    public LeakageReport Leakage => _leakage.Value;
    /// <summary>How the training vocabulary covers each part (train, validation, test).</summary>
    public IReadOnlyList<VocabularyCoverage> Coverage => _coverage.Value;

    internal PreparedFold(PreparedData data, int number, Split split)
    {
        Data = data;
        Number = number;
        Split = split;
        Summary = split.Summary with { ClassNames = data.Labels.Names };
        var options = data.Options;
        Vocabulary = Vocabulary.Build(split.Train.Select(p => data.Pieces[p]), options.MinTokenCount);
        (All, Truncation) = Encoder.EncodePieces(data.Pieces, data.LabelIds, Vocabulary, options.MaxLength, options.Truncation, data.Rows);
        Train = All.Subset(split.Train);
        Validation = All.Subset(split.Validation);
        Test = All.Subset(split.Test);
        _leakage = new Lazy<LeakageReport>(() => LeakageAudit.Run(data.UsedTable, split));
        _coverage = new Lazy<IReadOnlyList<VocabularyCoverage>>(() => Enumerable.Range(0, Split.PartNames.Count)
            .Select(p => Vocabulary.Coverage(split.Rows(p).Select(i => data.Pieces[i]), Split.PartNames[p])).ToArray());
    }

    public override string ToString() =>
        $"fold {Number} of {Data.FoldCount}: {Split.Train.Length} / {Split.Validation.Length} / {Split.Test.Length} rows, vocabulary {Vocabulary.Count}";
}
