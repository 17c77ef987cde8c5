using Kit.Common;
using Kit.Data;

namespace Kit.Bench.Training;

/// <summary>Seeded random token rows of one fixed length, as the ratio benches specify (no meaning, only shape).</summary>
internal static class TrainingBenchData
{
    public const int Vocabulary = 40, Classes = 5;

    public static EncodedSet Make(int rows, int length, ulong seed)
    {
        var rng = new SplitMix64(seed);
        var tokens = new int[rows * length];
        for (int i = 0; i < tokens.Length; i++) tokens[i] = 2 + rng.NextInt(Vocabulary - 2);
        var offsets = Enumerable.Range(0, rows + 1).Select(r => r * length).ToArray();
        var labels = Enumerable.Range(0, rows).Select(_ => rng.NextInt(Classes)).ToArray();
        return new EncodedSet(tokens, offsets, labels);
    }

    /// <summary>Rows of a batch as int64 tokens [B, T] and labels [B], built the plain way a hand-written loop would.</summary>
    public static (TorchSharp.torch.Tensor Tokens, TorchSharp.torch.Tensor Labels) Tensors(EncodedSet set, int[] rows, int length)
    {
        var ids = new long[rows.Length * length];
        var y = new long[rows.Length];
        for (int k = 0; k < rows.Length; k++)
        {
            var seq = set[rows[k]];
            for (int t = 0; t < length; t++) ids[k * length + t] = seq[t];
            y[k] = set.Labels[rows[k]];
        }
        return (TorchSharp.torch.tensor(ids, new long[] { rows.Length, length }), TorchSharp.torch.tensor(y));
    }

    public static double Median(IEnumerable<double> values)
    {
        var v = values.OrderBy(x => x).ToArray();
        return v.Length % 2 == 1 ? v[v.Length / 2] : 0.5 * (v[v.Length / 2 - 1] + v[v.Length / 2]);
    }
}
