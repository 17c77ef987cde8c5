namespace Kit.Data;

/// <summary>
/// Token ids of many sequences in one contiguous array with offsets (CSR layout), plus one label per
/// sequence. No object per token or per row, so a million short texts cost a few integers each.
/// Sequence i is Tokens[Offsets[i] .. Offsets[i+1]).
/// </summary>
public sealed class EncodedSet
{
    public int[] Tokens { get; }
    public int[] Offsets { get; }
    public int[] Labels { get; }
    /// <summary>Row number of each sequence in the source table (for error messages and error analysis).</summary>
    public int[] SourceRows { get; }
    public int Count => Labels.Length;

    public EncodedSet(int[] tokens, int[] offsets, int[] labels, int[]? sourceRows = null)
    {
        if (offsets.Length != labels.Length + 1)
            throw new ArgumentException($"offsets must have one more entry than labels ({offsets.Length} vs {labels.Length})");
        if (offsets[0] != 0 || offsets[^1] != tokens.Length)
            throw new ArgumentException("offsets must start at 0 and end at the token count");
        for (int i = 1; i < offsets.Length; i++)
            if (offsets[i] < offsets[i - 1]) throw new ArgumentException($"offsets decrease at {i}");
        Tokens = tokens;
        Offsets = offsets;
        Labels = labels;
        SourceRows = sourceRows ?? Enumerable.Range(0, labels.Length).ToArray();
        if (SourceRows.Length != labels.Length) throw new ArgumentException("one source row per sequence");
    }

    public ReadOnlySpan<int> this[int i] => Tokens.AsSpan(Offsets[i], Offsets[i + 1] - Offsets[i]);

    public int Length(int i) => Offsets[i + 1] - Offsets[i];

    public int[] Lengths()
    {
        var result = new int[Count];
        for (int i = 0; i < result.Length; i++) result[i] = Length(i);
        return result;
    }

    /// <summary>A compact copy holding only the given rows, in the given order.</summary>
    public EncodedSet Subset(IReadOnlyList<int> rows)
    {
        var offsets = new int[rows.Count + 1];
        for (int k = 0; k < rows.Count; k++) offsets[k + 1] = offsets[k] + Length(rows[k]);
        var tokens = new int[offsets[^1]];
        var labels = new int[rows.Count];
        var source = new int[rows.Count];
        for (int k = 0; k < rows.Count; k++)
        {
            this[rows[k]].CopyTo(tokens.AsSpan(offsets[k]));
            labels[k] = Labels[rows[k]];
            source[k] = SourceRows[rows[k]];
        }
        return new EncodedSet(tokens, offsets, labels, source);
    }

    /// <summary>Builds a set from per-row token arrays (tests and small inputs).</summary>
    public static EncodedSet FromSequences(IReadOnlyList<int[]> sequences, IReadOnlyList<int> labels)
    {
        if (sequences.Count != labels.Count) throw new ArgumentException("one label per sequence");
        var offsets = new int[sequences.Count + 1];
        for (int i = 0; i < sequences.Count; i++) offsets[i + 1] = offsets[i] + sequences[i].Length;
        var tokens = new int[offsets[^1]];
        for (int i = 0; i < sequences.Count; i++) sequences[i].CopyTo(tokens, offsets[i]);
        return new EncodedSet(tokens, offsets, labels.ToArray());
    }
}
