namespace Kit.Data;

/// <summary>Texts to an <see cref="EncodedSet"/>: tokenize, look up ids, cut to the maximum length by a stated policy.</summary>
public static class Encoder
{
    /// <summary>A whole table, labels as ids under <paramref name="labels"/> (e.g. the training table's map, so ids agree across sets).</summary>
    public static (EncodedSet Set, TruncationReport Report) Encode(LabelledTable table, LabelMap labels, ITokenizer tokenizer,
        Vocabulary vocab, int maxLength, TruncationPolicy policy) =>
        Encode(table.Texts, table.LabelIds(labels), tokenizer, vocab, maxLength, policy);

    public static (EncodedSet Set, TruncationReport Report) Encode(IReadOnlyList<string> texts, int[] labels, ITokenizer tokenizer,
        Vocabulary vocab, int maxLength, TruncationPolicy policy, int[]? sourceRows = null) =>
        EncodePieces(texts.Select(tokenizer.Split).ToArray(), labels, vocab, maxLength, policy, sourceRows);

    /// <summary>Rows already split into tokens (so a caller that needs the tokens anyway splits once).</summary>
    public static (EncodedSet Set, TruncationReport Report) EncodePieces(IReadOnlyList<IReadOnlyList<string>> rows, int[] labels,
        Vocabulary vocab, int maxLength, TruncationPolicy policy, int[]? sourceRows = null)
    {
        if (labels.Length != rows.Count) throw new ArgumentException($"{labels.Length} labels for {rows.Count} rows");
        if (maxLength < 1) throw new ArgumentOutOfRangeException(nameof(maxLength), "maxLength must be at least 1");
        var offsets = new int[rows.Count + 1];
        var tokens = new List<int>(rows.Count * 8);
        int truncated = 0, longest = 0, empty = 0;
        long dropped = 0;
        for (int i = 0; i < rows.Count; i++)
        {
            var pieces = rows[i];
            int n = pieces.Count;
            longest = Math.Max(longest, n);
            if (n == 0) empty++;
            int keep = Math.Min(n, maxLength);
            if (n > maxLength)
            {
                truncated++;
                dropped += n - maxLength;
            }
            int head = policy switch
            {
                TruncationPolicy.KeepHead => keep,
                TruncationPolicy.KeepTail => 0,
                _ => (keep + 1) / 2,
            };
            for (int t = 0; t < head; t++) tokens.Add(vocab.Id(pieces[t]));
            for (int t = n - (keep - head); t < n; t++) tokens.Add(vocab.Id(pieces[t]));
            offsets[i + 1] = tokens.Count;
        }
        var set = new EncodedSet(tokens.ToArray(), offsets, labels.ToArray(), sourceRows);
        return (set, new TruncationReport(rows.Count, maxLength, policy, truncated, dropped, tokens.Count, longest, empty));
    }
}
