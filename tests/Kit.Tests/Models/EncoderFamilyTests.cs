using Kit.Batching;
using Kit.Data;
using Kit.Models;
using Kit.Tests.Batching;
using Kit.Tests.Training;
using Kit.Training;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Models;

/// <summary>The convolutional and Transformer encoders beside the recurrent ones: shapes, padding, sizes, bundles.</summary>
[Collection(EngineRandomCollection.Name)]
public class EncoderFamilyTests
{
    public EncoderFamilyTests() => TestEngine.Load();

    /// <summary>Every encoder family (recurrent ones packed and not), with a mix of poolings and a Transformer of each position kind.</summary>
    public static IEnumerable<object[]> Families()
    {
        foreach (var cell in Enum.GetValues<CellKind>())
        {
            yield return [new ClassifierConfig(ModelProbe.Vocab, 3, cell, 5, 4, 2, true, Pooling: PoolingKind.Last)];
            yield return [new ClassifierConfig(ModelProbe.Vocab, 3, cell, 5, 4, 1, true, Pooling: PoolingKind.Last)];
            yield return [new ClassifierConfig(ModelProbe.Vocab, 3, cell, 5, 4, 2, false, Pooling: PoolingKind.Last)];
            yield return [new ClassifierConfig(ModelProbe.Vocab, 3, cell, 5, 4, 1, true, Pooling: PoolingKind.Attention, Packed: false)];
        }
        foreach (var pooling in Enum.GetValues<PoolingKind>())
            yield return [new ClassifierConfig(ModelProbe.Vocab, 3, EmbeddingSize: 5, HiddenSize: 4, Pooling: pooling, Encoder: EncoderKind.Convolution)];
        foreach (var positions in Enum.GetValues<PositionKind>())
            foreach (var pooling in new[] { PoolingKind.Mean, PoolingKind.Last, PoolingKind.Attention })
                yield return [new ClassifierConfig(ModelProbe.Vocab, 3, EmbeddingSize: 5, HiddenSize: 8, Layers: 2, Pooling: pooling,
                    Encoder: EncoderKind.Transformer, Heads: 2, Positions: positions, MaxPositions: 40)];
    }

    [Theory]
    [MemberData(nameof(Families))]
    public void A_rows_logits_do_not_change_when_the_batch_around_it_is_padded_longer(ClassifierConfig config)
    {
        var (model, set) = ModelProbe.Create(config, seed: 11, rows: 7, maxLength: 9);
        using var batch = BatchBuilder.Build(set, Enumerable.Range(0, set.Count).ToArray());
        using var noGrad = torch.no_grad();
        using var tight = model.forward(batch.Tokens, batch.Lengths);
        // Twelve more pad steps after every row: nothing a row can read has changed.
        using var longer = nn.functional.pad(batch.Tokens, new long[] { 0, 12 }, value: BatchBuilder.PadId);
        using var loose = model.forward(longer, batch.Lengths);
        // Each row alone, in a batch exactly its own length.
        for (int i = 0; i < set.Count; i++)
        {
            using var alone = BatchBuilder.Build(set, [i]);
            using var own = model.forward(alone.Tokens, alone.Lengths);
            ModelProbe.Close(ModelProbe.Row(tight[i]).Select(x => (double)x).ToArray(), ModelProbe.Row(own[0]), $"row {i} alone vs batched", 1e-5);
        }
        ModelProbe.Close(ModelProbe.Row(tight).Select(x => (double)x).ToArray(), ModelProbe.Row(loose), "padded 12 steps longer", 1e-5);
    }

    [Theory]
    [InlineData(EncoderKind.Convolution)]
    [InlineData(EncoderKind.Transformer)]
    [InlineData(EncoderKind.Recurrent)]
    public void Training_steps_with_dropout_give_finite_gradients_everywhere(EncoderKind kind)
    {
        // The engine's own 1-D convolution gave NaN/∞ input gradients here in about a third of such steps; the kit's
        // encoders must never hand the trainer one (it stops the run as diverged).
        var (model, set) = ModelProbe.Create(new ClassifierConfig(ModelProbe.Vocab, 3, EmbeddingSize: 8, HiddenSize: 8, Pooling: PoolingKind.Mean,
            Encoder: kind, Heads: 2, EmbeddingDropout: 0.2, LayerDropout: 0.2, HeadDropout: 0.2), seed: 3, rows: 6);
        model.train();
        using var batch = BatchBuilder.Build(set, Enumerable.Range(0, set.Count).ToArray());
        for (int step = 0; step < 60; step++)
        {
            model.zero_grad();
            using var logits = model.forward(batch.Tokens, batch.Lengths);
            using var loss = nn.functional.cross_entropy(logits, batch.Labels);
            loss.backward();
            foreach (var (name, p) in model.named_parameters())
                Assert.True(p.grad is null || p.grad.isfinite().all().item<bool>(), $"step {step}: gradient of {name} is not finite");
        }
    }

    [Fact]
    public void Parameter_counts_from_the_config_match_the_built_modules()
    {
        foreach (var pooling in Enum.GetValues<PoolingKind>())
            foreach (var head in Enum.GetValues<HeadKind>())
            {
                var cnn = new ClassifierConfig(37, 5, EmbeddingSize: 6, HiddenSize: 7, Pooling: pooling, Head: head, Encoder: EncoderKind.Convolution, Widths: [1, 3]);
                Assert.Equal(cnn.ParameterCount(), cnn.Build().ParameterCount());
                foreach (var positions in Enum.GetValues<PositionKind>())
                {
                    var transformer = new ClassifierConfig(37, 5, EmbeddingSize: 6, HiddenSize: 8, Layers: 2, Pooling: pooling, Head: head,
                        Encoder: EncoderKind.Transformer, Heads: 4, Positions: positions, MaxPositions: 30);
                    Assert.Equal(transformer.ParameterCount(), transformer.Build().ParameterCount());
                }
            }
        // By hand: CNN, V=10, E=4, widths 2 and 3 with 5 filters each, linear head to 2 classes:
        // embedding 40; convolutions 5×4×2 + 5 = 45 and 5×4×3 + 5 = 65; head (2×5)×2 + 2 = 22; total 172.
        Assert.Equal(172, new ClassifierConfig(10, 2, EmbeddingSize: 4, HiddenSize: 5, Encoder: EncoderKind.Convolution, Widths: [2, 3]).ParameterCount());
    }

    [Fact]
    public void Configs_that_cannot_be_built_are_refused_naming_the_field()
    {
        var heads = Assert.Throws<ArgumentException>(() => new ClassifierConfig(10, 2, HiddenSize: 6, Encoder: EncoderKind.Transformer, Heads: 4).Validate());
        Assert.Contains("Heads", heads.Message);
        var bidirectional = Assert.Throws<ArgumentException>(() => new ClassifierConfig(10, 2, Bidirectional: true, Encoder: EncoderKind.Convolution).Validate());
        Assert.Contains("Bidirectional", bidirectional.Message);
        var widths = Assert.Throws<ArgumentException>(() => new ClassifierConfig(10, 2, Encoder: EncoderKind.Convolution, Widths: [3, 0]).Validate());
        Assert.Contains("Widths", widths.Message);
    }

    [Fact]
    public void A_config_written_before_the_encoder_and_dropout_fields_still_reads_as_a_recurrent_model()
    {
        // The config JSON as bundles wrote it before encoder families existed (no Encoder, Heads, Positions, MaxPositions, Widths).
        const string old = """
            { "VocabularySize": 12, "Classes": 3, "Cell": "Lstm", "EmbeddingSize": 4, "HiddenSize": 5, "Layers": 1, "Bidirectional": false,
              "Pooling": "Max", "Head": "Linear", "MlpHidden": 64, "Packed": true, "Device": "cpu" }
            """;
        var config = ClassifierConfig.FromJson(old, "old bundle");
        Assert.Equal((EncoderKind.Recurrent, CellKind.Lstm, 0.0, 0.0, 0.0), (config.Encoder, config.Cell, config.EmbeddingDropout, config.LayerDropout, config.HeadDropout));
        Assert.Equal(config.ParameterCount(), config.Build().ParameterCount());
    }

    [Theory]
    [InlineData(EncoderKind.Convolution)]
    [InlineData(EncoderKind.Transformer)]
    public void Bundles_of_the_new_encoders_round_trip_with_the_same_scores_and_readouts(EncoderKind kind)
    {
        var tokenizer = new CharacterTokenizer();
        string[] texts = ["abcab", "cabba", "bbbca", "aacbb", "cccab", "abccc"];
        var vocabulary = Vocabulary.Build(texts.Select(tokenizer.Split));
        torch.manual_seed(3);
        var model = new ClassifierConfig(vocabulary.Count, 3, EmbeddingSize: 6, HiddenSize: 8, Pooling: PoolingKind.Max, Encoder: kind,
            Heads: 2, MaxPositions: 8, EmbeddingDropout: 0.2, LayerDropout: 0.1, HeadDropout: 0.3).Build();
        model.eval();
        var bundle = new ModelBundle
        {
            Model = model, Tokenizer = TokenizerSpec.Of(tokenizer), Vocabulary = vocabulary, Labels = new LabelMap(["x", "y", "z"]), MaxLength = 8,
        };
        var loaded = ModelBundle.FromBytes(bundle.ToBytes(), "memory");
        Assert.Equal(kind, loaded.Config.Encoder);
        Assert.Equal((0.2, 0.1, 0.3), (loaded.Config.EmbeddingDropout, loaded.Config.LayerDropout, loaded.Config.HeadDropout));
        var probe = new[] { "abc", "ccccbbba", "b" };
        Assert.Equal(TextScorer.Score(bundle, probe).Probabilities, TextScorer.Score(loaded, probe).Probabilities);
        // The readouts diagnostics use: pooled vectors of width PooledSize, the embedding matrix, occlusion scores.
        var (set, _) = Kit.Data.Encoder.Encode(probe, [0, 1, 2], tokenizer, vocabulary, 8, TruncationPolicy.KeepHead);
        var pooled = Kit.Experiments.ModelReadout.Pooled(loaded.Model, set);
        Assert.All(pooled, p => Assert.Equal(loaded.Config.PooledSize, p.Length));
        Assert.Equal(vocabulary.Count, Kit.Experiments.ModelReadout.Embedding(loaded.Model).Length);
        var occluded = Kit.Diagnostics.Occlusion.Compute(set[1].ToArray(), Kit.Experiments.ModelReadout.Scorer(loaded.Model), Vocabulary.UnknownId, 0);
        Assert.Equal(set[1].Length, occluded.Positions.Count);
    }
}
