using Kit.Batching;
using Kit.Data;
using Kit.Models;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>Runs a trained model over a set and hands back plain arrays for the diagnostics layer.</summary>
public static class Scoring
{
    /// <summary>Raw logits, one row per sequence, in the set's order.</summary>
    public static double[][] Logits(SequenceClassifier model, EncodedSet set, int batchSize = 512) =>
        Rows(model, set, (m, b) => m.forward(b.Tokens, b.Lengths), batchSize);

    /// <summary>
    /// Any per-row output of the model ([B, D] per batch), one row per sequence in the set's order, as doubles.
    /// Rows are batched in length order (and put back), so a batch holds little padding. Rows do not interact;
    /// the grouping can move only the last float bits.
    /// </summary>
    public static double[][] Rows(SequenceClassifier model, EncodedSet set, Func<SequenceClassifier, Batch, Tensor> read, int batchSize = 512)
    {
        Kit.Native.Engine.EnsureLoaded();
        model.eval();
        using var noGrad = torch.no_grad();
        var result = new double[set.Count][];
        var lengths = set.Lengths();
        var order = Enumerable.Range(0, set.Count).OrderBy(i => lengths[i]).ToArray();
        for (int start = 0; start < order.Length; start += batchSize)
        {
            var rows = order[start..Math.Min(order.Length, start + batchSize)];
            using var scope = torch.NewDisposeScope();
            using var batch = BatchBuilder.Build(set, rows);
            var output = read(model, batch).to(ScalarType.Float64).contiguous();
            var flat = output.data<double>().ToArray();
            int width = (int)output.shape[1];
            for (int i = 0; i < rows.Length; i++)
                result[rows[i]] = flat.AsSpan(i * width, width).ToArray();
        }
        return result;
    }

    /// <summary>Softmax of logits / temperature, computed stably in double precision.</summary>
    public static double[][] Softmax(double[][] logits, double temperature = 1.0)
    {
        var result = new double[logits.Length][];
        for (int i = 0; i < logits.Length; i++)
        {
            var z = logits[i];
            double max = z.Max();
            var p = new double[z.Length];
            double sum = 0;
            for (int k = 0; k < z.Length; k++) sum += p[k] = Math.Exp((z[k] - max) / temperature);
            for (int k = 0; k < z.Length; k++) p[k] /= sum;
            result[i] = p;
        }
        return result;
    }
}
