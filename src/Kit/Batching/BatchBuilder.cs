using Kit.Data;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Batching;

/// <summary>Turns rows of an <see cref="EncodedSet"/> into a padded <see cref="Batch"/>.</summary>
public static class BatchBuilder
{
    public const int PadId = 0;
    public const int UnknownId = 1;

    public static Batch Build(EncodedSet set, IReadOnlyList<int> rows, PaddingOptions? options = null)
    {
        Kit.Native.Engine.EnsureLoaded();
        options ??= PaddingOptions.Default;
        options.Validate();
        if (rows.Count == 0) throw new ArgumentException("a batch needs at least one row");

        int longest = 0;
        for (int k = 0; k < rows.Count; k++)
        {
            int r = rows[k];
            if ((uint)r >= (uint)set.Count)
                throw new ArgumentOutOfRangeException(nameof(rows), $"row index {r} is outside the set (0..{set.Count - 1})");
            int len = set.Length(r);
            // The engine cannot pack an empty sequence, and a classifier has nothing to read in one.
            if (len == 0) throw new ArgumentException($"row {r} (source row {set.SourceRows[r]}) has no tokens; remove empty rows before batching");
            if (options.To == PadTo.Fixed && len > options.FixedLength && !options.Truncate)
                throw new ArgumentException(
                    $"row {r} (source row {set.SourceRows[r]}) has {len} tokens, more than FixedLength {options.FixedLength}; " +
                    "raise FixedLength or set Truncate");
            longest = Math.Max(longest, len);
        }
        int steps = options.To == PadTo.Fixed ? options.FixedLength!.Value : longest;

        int b = rows.Count;
        var ids = new long[b * steps];           // zero-filled = PadId
        var mask = new bool[b * steps];
        var lengths = new long[b];
        var labels = new long[b];
        int real = 0;
        for (int k = 0; k < b; k++)
        {
            var seq = set[rows[k]];
            int len = Math.Min(seq.Length, steps);
            int start = k * steps + (options.Side == PadSide.Left ? steps - len : 0);
            for (int t = 0; t < len; t++)
            {
                ids[start + t] = seq[t];
                mask[start + t] = true;
            }
            lengths[k] = len;
            labels[k] = set.Labels[rows[k]];
            real += len;
        }
        var shape = new long[] { b, steps };
        return new Batch(
            torch.tensor(ids, shape, ScalarType.Int64),
            torch.tensor(lengths, ScalarType.Int64),
            torch.tensor(mask, shape),
            torch.tensor(labels, ScalarType.Int64),
            rows.ToArray(), options.Side, real, steps);
    }
}
