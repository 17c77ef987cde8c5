using Kit.Batching;
using Kit.Data;
using Kit.Models;
using Kit.Training;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Experiments;

/// <summary>
/// Reads a trained model's insides out as plain arrays (pooled vectors, the embedding matrix, a scoring
/// function) so the diagnostics, which never see a tensor, can work on them.
/// </summary>
public static class ModelReadout
{
    /// <summary>The pooled representation the head reads, one row per sequence, in the set's order.</summary>
    public static double[][] Pooled(SequenceClassifier model, EncodedSet set, int batchSize = 512)
    {
        Kit.Native.Engine.EnsureLoaded();
        model.eval();
        using var noGrad = torch.no_grad();
        var result = new double[set.Count][];
        foreach (var rows in new SequentialBatchSampler(batchSize).Batches(set, 0))
        {
            using var scope = torch.NewDisposeScope();
            using var batch = BatchBuilder.Build(set, rows);
            var pooled = model.Pooled(batch.Tokens, batch.Lengths).to(ScalarType.Float64).contiguous();
            var flat = pooled.data<double>().ToArray();
            int width = (int)pooled.shape[1];
            for (int i = 0; i < rows.Length; i++)
                result[rows[i]] = flat.AsSpan(i * width, width).ToArray();
        }
        return result;
    }

    /// <summary>Row t is the embedding of token id t.</summary>
    public static double[][] Embedding(SequenceClassifier model)
    {
        Kit.Native.Engine.EnsureLoaded();
        using var scope = torch.NewDisposeScope();
        var matrix = model.EmbeddingMatrix().to(ScalarType.Float64).contiguous();
        int rows = (int)matrix.shape[0], width = (int)matrix.shape[1];
        var flat = matrix.data<double>().ToArray();
        return Enumerable.Range(0, rows).Select(r => flat.AsSpan(r * width, width).ToArray()).ToArray();
    }

    /// <summary>A batch scorer for <see cref="Kit.Diagnostics.Occlusion"/>: token-id sequences → class probabilities.</summary>
    public static Func<int[][], double[][]> Scorer(SequenceClassifier model) => sequences =>
        Scoring.Softmax(Scoring.Logits(model, EncodedSet.FromSequences(sequences, new int[sequences.Length])));
}
