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
    public static double[][] Pooled(SequenceClassifier model, EncodedSet set, int batchSize = 512) =>
        Scoring.Rows(model, set, (m, b) => m.Pooled(b.Tokens, b.Lengths), batchSize);

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
