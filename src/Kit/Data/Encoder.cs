namespace Kit.Data;

/// <summary>Texts to an <see cref="EncodedSet"/>: tokenize, look up ids, cut to the maximum length by a stated policy.</summary>
public static class Encoder
{
    public static (EncodedSet Set, TruncationReport Report) Encode(IReadOnlyList<string> texts, int[] labels, ITokenizer tokenizer,
        Vocabulary vocab, int maxLength, TruncationPolicy policy, int[]? sourceRows = null)
    {
        if (labels.Length != texts.Count) throw new ArgumentException($"{labels.Length} labels for {texts.Count} texts");
        if (maxLength < 1) throw new ArgumentOutOfRangeException(nameof(maxLength), "maxLength must be at least 1");
        var offsets = new int[texts.Count + 1];
        var tokens = new List<int>(texts.Count * 8);
        int truncated = 0, longest = 0, empty = 0;
        long dropped = 0;
        for (int i = 0; i < texts.Count; i++)
        {
            var pieces = tokenizer.Split(texts[i]);
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
        return (set, new TruncationReport(texts.Count, maxLength, policy, truncated, dropped, tokens.Count, longest, empty));
    }
}
