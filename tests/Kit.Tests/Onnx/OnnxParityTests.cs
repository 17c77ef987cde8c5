using Kit.Models;
using Kit.Scoring;
using Kit.Training;

namespace Kit.Tests.Onnx;

/// <summary>
/// Outside check of the model wiring: ONNX Runtime (Microsoft.ML.OnnxRuntime 1.31.1) implements the published ONNX
/// operator definitions (GRU, LSTM, RNN, Softmax… in ONNX Operators.md) independently of the engine, so equal
/// probabilities on real demo rows mean the export maps gates, directions, pooling masks, head and temperature right.
/// The same holds for the convolutional encoder (windows, zero padding) and the Transformer encoder (LayerNormalization,
/// MatMul, Softmax with the key padding mask, positions); the demo rows differ in length, so every batch has pad steps.
/// </summary>
[Collection(Kit.Tests.Training.EngineRandomCollection.Name)]
public sealed class OnnxParityTests : IDisposable
{
    readonly string _dir = OnnxSamples.TempDir();

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    public static TheoryData<CellKind, PoolingKind, int, bool> Shapes()
    {
        var data = new TheoryData<CellKind, PoolingKind, int, bool>();
        foreach (var cell in Enum.GetValues<CellKind>())
            foreach (var pooling in Enum.GetValues<PoolingKind>())
                foreach (int layers in new[] { 1, 2 })
                    foreach (bool bidirectional in new[] { false, true })
                        data.Add(cell, pooling, layers, bidirectional);
        return data;
    }

    [Theory]
    [MemberData(nameof(Shapes))]
    public void Onnx_runtime_matches_the_engine(CellKind cell, PoolingKind pooling, int layers, bool bidirectional)
    {
        var shape = new ClassifierConfig(2, 2, cell, EmbeddingSize: 8, HiddenSize: 6, Layers: layers, Bidirectional: bidirectional, Pooling: pooling);
        AssertParity(OnnxSamples.Bundle(shape));
    }

    [Theory]
    [InlineData(CellKind.Gru, PoolingKind.Last)]
    [InlineData(CellKind.Lstm, PoolingKind.Attention)]
    [InlineData(CellKind.Rnn, PoolingKind.Max)]
    [InlineData(CellKind.Lstm, PoolingKind.Last)]
    [InlineData(CellKind.Lstm, PoolingKind.Mean)]
    [InlineData(CellKind.Gru, PoolingKind.Attention)]
    public void Unpacked_bidirectional_stacks_with_an_mlp_head_match_too(CellKind cell, PoolingKind pooling)
    {
        // Unpacked bidirectional stacks keep one engine cell per layer and direction: a different weight layout.
        var shape = new ClassifierConfig(2, 2, cell, EmbeddingSize: 8, HiddenSize: 6, Layers: 2, Bidirectional: true, Pooling: pooling,
            Head: HeadKind.Mlp, MlpHidden: 7, Packed: false);
        AssertParity(OnnxSamples.Bundle(shape, temperature: null));
    }

    [Theory]
    [InlineData(CellKind.Gru)]
    [InlineData(CellKind.Lstm)]
    [InlineData(CellKind.Rnn)]
    public void One_row_at_a_time_matches_too(CellKind cell)
    {
        // A batch with no padded row takes the engine's dense path rather than its packed one.
        var shape = new ClassifierConfig(2, 2, cell, EmbeddingSize: 8, HiddenSize: 6, Pooling: PoolingKind.Mean);
        var bundle = OnnxSamples.Bundle(shape);
        foreach (var text in OnnxSamples.Texts(12)) AssertParity(bundle, new[] { text }, minimumSpread: 0);
    }

    public static TheoryData<PoolingKind, bool> ConvolutionShapes()
    {
        var data = new TheoryData<PoolingKind, bool>();
        foreach (var pooling in Enum.GetValues<PoolingKind>())
            foreach (bool defaultWidths in new[] { true, false })
                data.Add(pooling, defaultWidths);
        return data;
    }

    [Theory]
    [MemberData(nameof(ConvolutionShapes))]
    public void Convolution_encoder_matches_the_engine(PoolingKind pooling, bool defaultWidths)
    {
        // The default widths 2..5, and a set with width 1 and one wider than the shortest demo rows (windows past a row's end).
        var shape = new ClassifierConfig(2, 2, EmbeddingSize: 8, HiddenSize: 6, Pooling: pooling, Encoder: EncoderKind.Convolution,
            Widths: defaultWidths ? null : new[] { 1, 3, 9 }, EmbeddingDropout: 0.3, HeadDropout: 0.3);
        var bundle = OnnxSamples.Bundle(shape);
        // A pad row that is not zero (padding_idx keeps it at zero only while training from scratch): the engine zeroes
        // pad steps before the windows, so the graph must too, or windows reaching past a row's end would differ.
        using (TorchSharp.torch.no_grad())
            bundle.Model.state_dict()["embedding.weight"][0].fill_(0.7f);
        AssertParity(bundle);
    }

    public static TheoryData<PoolingKind, int, PositionKind> TransformerShapes()
    {
        var data = new TheoryData<PoolingKind, int, PositionKind>();
        foreach (var pooling in Enum.GetValues<PoolingKind>())
            foreach (int layers in new[] { 1, 2 })
                foreach (var positions in Enum.GetValues<PositionKind>())
                    data.Add(pooling, layers, positions);
        return data;
    }

    [Theory]
    [MemberData(nameof(TransformerShapes))]
    public void Transformer_encoder_matches_the_engine(PoolingKind pooling, int layers, PositionKind positions)
    {
        // Dropout is set so that a graph that applied it, or an engine left in training mode, would disagree.
        var shape = new ClassifierConfig(2, 2, EmbeddingSize: 8, HiddenSize: 8, Layers: layers, Pooling: pooling, Encoder: EncoderKind.Transformer,
            Heads: 2, Positions: positions, MaxPositions: 30, LayerDropout: 0.3, EmbeddingDropout: 0.3);
        AssertParity(OnnxSamples.Bundle(shape, scale: 1.5));
    }

    [Theory]
    [InlineData(EncoderKind.Convolution, PoolingKind.Attention)]
    [InlineData(EncoderKind.Transformer, PoolingKind.Max)]
    public void Other_encoders_with_an_mlp_head_and_one_row_at_a_time_match_too(EncoderKind encoder, PoolingKind pooling)
    {
        var shape = new ClassifierConfig(2, 2, EmbeddingSize: 8, HiddenSize: 8, Layers: 2, Pooling: pooling, Encoder: encoder, Heads: 4,
            Head: HeadKind.Mlp, MlpHidden: 7);
        var bundle = OnnxSamples.Bundle(shape, temperature: null, scale: 1.5);
        AssertParity(bundle);
        foreach (var text in OnnxSamples.Texts(6)) AssertParity(bundle, new[] { text }, minimumSpread: 0);
    }

    [Fact]
    public void A_learned_position_table_shorter_than_the_rows_is_refused()
    {
        // The engine throws on a batch longer than its table; an exported Slice would cut it silently, so export refuses.
        var shape = new ClassifierConfig(2, 2, EmbeddingSize: 8, HiddenSize: 8, Encoder: EncoderKind.Transformer, Heads: 2,
            Positions: PositionKind.Learned, MaxPositions: 16);
        var e = Assert.Throws<NotSupportedException>(() => OnnxExport.Write(OnnxSamples.Bundle(shape, maxLength: 24), Path.Combine(_dir, "x.onnx")));
        Assert.Contains("learned position table holds 16", e.Message);
    }

    void AssertParity(ModelBundle bundle) => AssertParity(bundle, OnnxSamples.Texts(), minimumSpread: 0.15);

    void AssertParity(ModelBundle bundle, IReadOnlyList<string> texts, double minimumSpread)
    {
        var engine = TextScorer.Score(bundle, texts);
        string path = Path.Combine(_dir, "m.onnx");
        OnnxExport.Write(bundle, path);
        using var onnx = ScoringModel.Load(path);
        var scored = onnx.Score(texts);
        double worst = 0, spread = 0;
        for (int i = 0; i < texts.Count; i++)
        {
            Assert.Equal(engine.Flags[i].ToString(), scored[i].Flag.ToString());
            Assert.Equal(engine.Tokens[i], scored[i].Tokens);
            Assert.Equal(engine.Truncated[i], scored[i].Truncated);
            var p = engine.Probabilities[i];
            if (p is null) { Assert.Null(scored[i].Probabilities); continue; }
            for (int k = 0; k < p.Length; k++) worst = Math.Max(worst, Math.Abs(p[k] - scored[i].Probabilities![k]));
            spread = Math.Max(spread, p.Max() - p.Min());
        }
        Assert.True(worst <= 1e-5, $"largest probability difference {worst:E2} exceeds 1e-5");
        // Guard against a vacuous pass: near-uniform outputs would agree whatever the wiring.
        if (minimumSpread > 0) Assert.True(spread > minimumSpread, $"outputs are too flat ({spread:F3}) for the comparison to mean anything");
    }
}
