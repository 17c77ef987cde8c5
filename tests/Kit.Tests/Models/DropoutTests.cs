using Kit.Batching;
using Kit.Models;
using Kit.Tests.Batching;
using Kit.Tests.Training;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Models;

/// <summary>
/// Dropout (Srivastava et al. 2014, JMLR 15) in the engine's "inverted" form: in training each unit is kept with
/// probability 1 − p and scaled by 1 / (1 − p); in evaluation it is the identity.
/// </summary>
[Collection(EngineRandomCollection.Name)]
public class DropoutTests
{
    public DropoutTests() => TestEngine.Load();

    public static IEnumerable<object[]> Families() =>
    [
        [new ClassifierConfig(ModelProbe.Vocab, 3, CellKind.Lstm, 5, 4, Layers: 2, Bidirectional: true, Packed: false)],
        [new ClassifierConfig(ModelProbe.Vocab, 3, CellKind.Gru, 5, 4, Layers: 2)],
        [new ClassifierConfig(ModelProbe.Vocab, 3, EmbeddingSize: 5, HiddenSize: 4, Pooling: PoolingKind.Max, Encoder: EncoderKind.Convolution)],
        [new ClassifierConfig(ModelProbe.Vocab, 3, EmbeddingSize: 5, HiddenSize: 8, Layers: 2, Pooling: PoolingKind.Mean, Encoder: EncoderKind.Transformer, Heads: 2)],
    ];

    [Theory]
    [MemberData(nameof(Families))]
    public void Dropout_has_no_effect_in_evaluation_mode_and_each_rate_acts_in_training(ClassifierConfig bare)
    {
        var (model, set) = ModelProbe.Create(bare with { EmbeddingDropout = 0.5, LayerDropout = 0.5, HeadDropout = 0.5 }, seed: 5, rows: 8);
        var plain = bare.Build();
        plain.load_state_dict(model.state_dict());
        using var batch = BatchBuilder.Build(set, Enumerable.Range(0, set.Count).ToArray());
        using var noGrad = torch.no_grad();
        model.eval(); plain.eval();
        using var withDropout = model.forward(batch.Tokens, batch.Lengths);
        using var without = plain.forward(batch.Tokens, batch.Lengths);
        Assert.Equal(ModelProbe.Row(without), ModelProbe.Row(withDropout));

        // Each rate alone, in training mode, changes the logits: every one of the three sits on the path. (Layer
        // dropout exists only between two layers or inside Transformer blocks; a CNN has one layer.)
        var rates = new List<ClassifierConfig> { bare with { EmbeddingDropout = 0.5 }, bare with { HeadDropout = 0.5 } };
        if (bare.Encoder != EncoderKind.Convolution) rates.Add(bare with { LayerDropout = 0.5 });
        foreach (var config in rates)
        {
            var one = config.Build();
            one.load_state_dict(model.state_dict());
            one.train();
            torch.manual_seed(9);
            using var trained = one.forward(batch.Tokens, batch.Lengths);
            Assert.NotEqual(ModelProbe.Row(without), ModelProbe.Row(trained));
        }
        // And with every rate at zero, training mode gives the evaluation logits.
        plain.train();
        using var zero = plain.forward(batch.Tokens, batch.Lengths);
        ModelProbe.Close(ModelProbe.Row(without).Select(x => (double)x).ToArray(), ModelProbe.Row(zero), "no dropout, training mode", 1e-6);
    }

    [Fact]
    public void Each_dropout_keeps_the_expected_share_in_training_and_scales_survivors()
    {
        var config = new ClassifierConfig(ModelProbe.Vocab, 3, EmbeddingSize: 5, HiddenSize: 8, Encoder: EncoderKind.Transformer, Heads: 2,
            EmbeddingDropout: 0.1, LayerDropout: 0.3, HeadDropout: 0.5);
        torch.manual_seed(21);
        var model = config.Build();
        model.train();
        var modules = model.named_modules().ToDictionary(m => m.name, m => m.module);
        const int n = 400_000;
        foreach (var (name, p) in new[] { ("embedding_dropout", 0.1), ("encoder.dropout", 0.3), ("head_dropout", 0.5) })
        {
            var dropout = (nn.Module<Tensor, Tensor>)modules[name];
            using var ones = torch.ones(n);
            using var output = dropout.call(ones);
            var values = output.data<float>().ToArray();
            double kept = values.Count(v => v != 0) / (double)n;
            // Kept units are Binomial(n, 1 − p); 5 standard deviations is a two-sided false-alarm chance of about 6e-7
            // (normal approximation), while a wrong rate wired here (e.g. 0.1 for 0.3) misses by hundreds of them.
            double sd = Math.Sqrt(p * (1 - p) / n);
            Assert.True(Math.Abs(kept - (1 - p)) <= 5 * sd, $"{name}: kept {kept:F4}, expected {1 - p:F4} ± {5 * sd:F4}");
            Assert.All(values.Where(v => v != 0).Distinct(), v => Assert.Equal(1 / (1 - p), v, 5));
        }
        model.eval();
        foreach (var name in new[] { "embedding_dropout", "encoder.dropout", "head_dropout" })
        {
            using var ones = torch.ones(1000);
            using var output = ((nn.Module<Tensor, Tensor>)modules[name]).call(ones);
            Assert.All(output.data<float>().ToArray(), v => Assert.Equal(1f, v));
        }
    }
}
