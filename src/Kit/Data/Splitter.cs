using Kit.Common;
namespace Kit.Data;

/// <summary>
/// Seeded, deterministic splits. Every method returns row indices (ascending within a part) and a summary;
/// the same inputs and seed give the same split on any machine. Lengths, when given, only feed the summary
/// (and the strata of <see cref="LengthStratified"/>).
/// </summary>
public static class Splitter
{
    /// <summary>Train / validation / test with every class split in the given fractions (each part's count of a class within one row of exact).</summary>
    public static Split StratifiedHoldout(int[] labels, double train, double validation, double test, ulong seed, int[]? lengths = null)
    {
        var fractions = Fractions(train, validation, test);
        var part = Stratified(labels, fractions, seed);
        return Build("stratified holdout", seed, labels, lengths, part);
    }

    /// <summary>
    /// k folds, each class spread so that every fold holds the floor or ceiling of its count / k.
    /// Fold i's Test is fold i; its Train is the other folds, minus a stratified Validation share when
    /// <paramref name="validation"/> &gt; 0 (carved from those folds, never from the test fold).
    /// </summary>
    public static IReadOnlyList<Split> FoldsByClass(int[] labels, int k, ulong seed, double validation = 0, int[]? lengths = null)
    {
        CheckK(k, labels.Length);
        var fold = Stratified(labels, Enumerable.Repeat(1.0 / k, k).ToArray(), seed);
        return Folds("stratified k-fold", seed, labels, lengths, fold, k, validation,
            (rows, s) => Stratified(rows.Select(r => labels[r]).ToArray(), [1 - validation, validation], s));
    }

    /// <summary>Like <see cref="StratifiedHoldout"/> but whole groups go to one part (see <see cref="GroupAssigner"/>).</summary>
    public static Split GroupHoldout(int[] labels, string[] groups, double train, double validation, double test, ulong seed, int[]? lengths = null)
    {
        var fractions = Fractions(train, validation, test);
        return Build("group holdout", seed, labels, lengths, GroupAssigner.Assign(labels, groups, fractions, seed));
    }

    /// <summary>k folds of whole groups, as stratified as the groups allow; Validation (when asked for) is carved by group from the training folds.</summary>
    public static IReadOnlyList<Split> FoldsByGroup(int[] labels, string[] groups, int k, ulong seed, double validation = 0, int[]? lengths = null)
    {
        CheckK(k, labels.Length);
        var fold = GroupAssigner.Assign(labels, groups, Enumerable.Repeat(1.0 / k, k).ToArray(), seed);
        return Folds("group k-fold", seed, labels, lengths, fold, k, validation,
            (rows, s) => GroupAssigner.Assign(rows.Select(r => labels[r]).ToArray(), rows.Select(r => groups[r]).ToArray(), [1 - validation, validation], s));
    }

    /// <summary>
    /// Holdout stratified on length bin × class, so short and long sequences of every class reach every part.
    /// Bins are length quantiles over all rows (ties keep equal lengths in one bin, so there may be fewer bins).
    /// </summary>
    public static Split LengthStratified(int[] labels, int[] lengths, double train, double validation, double test, ulong seed, int bins = 4)
    {
        if (lengths.Length != labels.Length) throw new ArgumentException($"{lengths.Length} lengths for {labels.Length} labels");
        if (bins < 1) throw new ArgumentOutOfRangeException(nameof(bins), "bins must be at least 1");
        var fractions = Fractions(train, validation, test);
        var bin = LengthBins(lengths, bins);
        int classes = labels.Length == 0 ? 0 : labels.Max() + 1;
        var strata = labels.Select((l, i) => bin[i] * classes + l).ToArray();
        return Build($"length-stratified holdout ({bin.DefaultIfEmpty().Max() + 1} length bins)", seed, labels, lengths, Stratified(strata, fractions, seed));
    }

    /// <summary>The split a source already carries in its split column (see <see cref="ColumnSpec.Split"/>).</summary>
    public static Split FromColumn(IReadOnlyList<string> splitValues, int[] labels, int[]? lengths = null)
    {
        var part = splitValues.Select((v, i) => SplitNames.Canonical(v) switch
        {
            SplitNames.Train => Split.TrainPart,
            SplitNames.Validation => Split.ValidationPart,
            SplitNames.Test => Split.TestPart,
            _ => throw new ArgumentException($"row {i}: split value '{v}' is not one of {SplitNames.Accepted}"),
        }).ToArray();
        return Build("given by the split column", 0, labels, lengths, part);
    }

    /// <summary>Bin of every row: quantile cut points of the lengths; equal lengths always share a bin.</summary>
    internal static int[] LengthBins(int[] lengths, int bins)
    {
        var sorted = (int[])lengths.Clone();
        Array.Sort(sorted);
        var cuts = Enumerable.Range(1, bins - 1).Select(b => LengthStats.Quantile(sorted, (double)b / bins)).Distinct().ToArray();
        return lengths.Select(len => cuts.Count(c => len > c)).ToArray();
    }

    static int[] Stratified(int[] labels, double[] fractions, ulong seed)
    {
        if (labels.Any(l => l < 0)) throw new ArgumentException("labels must be non-negative class ids");
        int classes = labels.Length == 0 ? 0 : labels.Max() + 1;
        var members = new List<int>[classes];
        for (int c = 0; c < classes; c++) members[c] = new List<int>();
        for (int i = 0; i < labels.Length; i++) members[labels[i]].Add(i);
        var quota = QuotaAllocator.Allocate(members.Select(m => m.Count).ToArray(), fractions);
        var rng = new SplitMix64(seed);
        var part = new int[labels.Length];
        for (int c = 0; c < classes; c++)
        {
            var rows = members[c].ToArray();
            rng.Shuffle(rows.AsSpan());
            int at = 0;
            for (int p = 0; p < fractions.Length; p++)
                for (int k = 0; k < quota[c, p]; k++) part[rows[at++]] = p;
        }
        return part;
    }

    static IReadOnlyList<Split> Folds(string method, ulong seed, int[] labels, int[]? lengths, int[] fold, int k, double validation,
        Func<int[], ulong, int[]> carve)
    {
        if (validation is < 0 or >= 1) throw new ArgumentOutOfRangeException(nameof(validation), "validation must be in [0, 1)");
        var splits = new List<Split>(k);
        for (int f = 0; f < k; f++)
        {
            var test = Rows(fold, f);
            var rest = Enumerable.Range(0, labels.Length).Where(r => fold[r] != f).ToArray();
            int[] train = rest, valid = [];
            if (validation > 0)
            {
                var inner = carve(rest, seed ^ (0x9E3779B97F4A7C15UL * (ulong)(f + 1)));
                train = rest.Where((_, i) => inner[i] == 0).ToArray();
                valid = rest.Where((_, i) => inner[i] == 1).ToArray();
            }
            var summary = SplitSummary.Of($"{method} (fold {f + 1} of {k})", seed, labels, lengths,
                ("train", train), ("validation", valid), ("test", test));
            splits.Add(new Split(train, valid, test, summary));
        }
        return splits;
    }

    static Split Build(string method, ulong seed, int[] labels, int[]? lengths, int[] part)
    {
        if (lengths is not null && lengths.Length != labels.Length) throw new ArgumentException($"{lengths.Length} lengths for {labels.Length} labels");
        var train = Rows(part, 0);
        var valid = Rows(part, 1);
        var test = Rows(part, 2);
        var summary = SplitSummary.Of(method, seed, labels, lengths, ("train", train), ("validation", valid), ("test", test));
        return new Split(train, valid, test, summary);
    }

    static int[] Rows(int[] part, int p)
    {
        var rows = new List<int>();
        for (int i = 0; i < part.Length; i++) if (part[i] == p) rows.Add(i);
        return rows.ToArray();
    }

    static double[] Fractions(double train, double validation, double test)
    {
        double[] f = [train, validation, test];
        if (f.Any(x => x < 0 || double.IsNaN(x))) throw new ArgumentOutOfRangeException(nameof(train), "fractions must be non-negative");
        if (Math.Abs(f.Sum() - 1) > 1e-9) throw new ArgumentException($"fractions must add up to 1 (they add up to {f.Sum()})");
        return f;
    }

    static void CheckK(int k, int rows)
    {
        if (k < 2) throw new ArgumentOutOfRangeException(nameof(k), "k must be at least 2");
        if (k > rows) throw new ArgumentOutOfRangeException(nameof(k), $"k = {k} is more than the {rows} row(s)");
    }
}
