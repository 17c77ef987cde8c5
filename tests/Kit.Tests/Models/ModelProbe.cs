using Kit.Batching;
using Kit.Data;
using Kit.Models;
using Kit.Tests.Batching;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Models;

/// <summary>Builds small models and batches, and reads a model's weights and outputs as plain arrays.</summary>
internal static class ModelProbe
{
    public const int Vocab = 14;

    public static (SequenceClassifier Model, EncodedSet Set) Create(ClassifierConfig config, int seed, int rows = 6, int maxLength = 9)
    {
        TestEngine.Load();
        torch.manual_seed(seed);
        var model = config.Build();
        model.eval();
        var random = new Random(seed);
        var lengths = Enumerable.Range(0, rows).Select(_ => random.Next(1, maxLength + 1)).ToList();
        lengths[0] = maxLength;  // one full row, the rest padded
        return (model, TestEngine.RandomSet(lengths, Vocab, config.Classes, seed));
    }

    public static ClassifierConfig Config(CellKind cell, bool bidirectional, bool packed, int layers = 1, PoolingKind pooling = PoolingKind.Last) =>
        new(Vocab, 3, cell, EmbeddingSize: 5, HiddenSize: 4, Layers: layers, Bidirectional: bidirectional, Pooling: pooling, Packed: packed);

    /// <summary>The weights of one layer and direction, wherever the encoder keeps them.</summary>
    public static CellWeights Weights(SequenceClassifier model, int layer, int direction)
    {
        var fused = model.Encoder.FusedCell;
        var cell = fused ?? model.Encoder.SplitCell(layer, direction);
        string suffix = fused is null ? "_l0" : $"_l{layer}" + (direction == 1 ? "_reverse" : "");
        var p = cell.named_parameters().ToDictionary(kv => kv.name, kv => kv.parameter);
        float[] Read(string name) => p[name + suffix].detach().cpu().data<float>().ToArray();
        var wih = p["weight_ih" + suffix];
        return new CellWeights(Read("weight_ih"), Read("weight_hh"), Read("bias_ih"), Read("bias_hh"),
            (int)wih.shape[1], model.Config.HiddenSize);
    }

    /// <summary>Row i's embedded tokens, one double vector per step.</summary>
    public static List<double[]> Embedded(SequenceClassifier model, EncodedSet set, int row)
    {
        using var matrix = model.EmbeddingMatrix();
        var m = matrix.data<float>().ToArray();
        int e = model.Config.EmbeddingSize;
        var result = new List<double[]>();
        foreach (int id in set[row].ToArray())
            result.Add(Enumerable.Range(0, e).Select(k => (double)m[id * e + k]).ToArray());
        return result;
    }

    public static float[] Row(Tensor t) => t.detach().cpu().contiguous().data<float>().ToArray();

    public static void Close(IReadOnlyList<double> expected, IReadOnlyList<float> actual, string what, double tolerance = 1e-5)
    {
        Assert.Equal(expected.Count, actual.Count);
        double worst = 0;
        for (int k = 0; k < expected.Count; k++) worst = Math.Max(worst, Math.Abs(expected[k] - actual[k]));
        Assert.True(worst <= tolerance, $"{what}: max difference {worst:E2} > {tolerance:E0}");
    }

    public static Batch Batch(EncodedSet set, PadSide side = PadSide.Right) =>
        BatchBuilder.Build(set, Enumerable.Range(0, set.Count).ToArray(), new PaddingOptions(Side: side));
}
