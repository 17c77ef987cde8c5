using Kit.Batching;
using Kit.Models;
using Kit.Tests.Batching;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Models;

public class SequenceClassifierTests
{
    public SequenceClassifierTests() => TestEngine.Load();

    [Fact]
    public void Config_parameter_count_matches_the_built_module()
    {
        foreach (var cell in Enum.GetValues<CellKind>())
            foreach (var pooling in Enum.GetValues<PoolingKind>())
                foreach (var head in Enum.GetValues<HeadKind>())
                    foreach (var (layers, bidirectional, packed) in new[] { (1, false, true), (3, true, true), (2, true, false) })
                    {
                        var config = new ClassifierConfig(37, 5, cell, 6, 7, layers, bidirectional, Pooling: pooling, Head: head, MlpHidden: 9, Packed: packed);
                        var model = config.Build();
                        Assert.Equal(config.ParameterCount(), model.ParameterCount());
                    }
        // Worked by hand: GRU, V=10, E=4, H=3, one layer, linear head to 2 classes:
        // embedding 40; GRU 3 gates × (3×4 + 3×3 + 3 + 3) = 81; head 3×2 + 2 = 8; total 129.
        Assert.Equal(129, new ClassifierConfig(10, 2, CellKind.Gru, 4, 3).ParameterCount());
    }

    [Fact]
    public void Config_round_trips_through_json_and_bad_json_names_the_source_and_field()
    {
        var config = new ClassifierConfig(120, 7, CellKind.Lstm, 16, 24, 2, true, 0.1, 0.2, 0.3, PoolingKind.Attention, HeadKind.Mlp, 12, false);
        var json = config.ToJson();
        Assert.Contains("\"Lstm\"", json);
        Assert.Equal(config, ClassifierConfig.FromJson(json));

        var unknown = Assert.Throws<FormatException>(() => ClassifierConfig.FromJson("{\"VocabularySize\": 5, \"Classes\": 2, \"Hiden\": 3}", "bundle/model.json"));
        Assert.Contains("bundle/model.json", unknown.Message);
        var invalid = Assert.Throws<FormatException>(() => ClassifierConfig.FromJson("{\"VocabularySize\": 5, \"Classes\": 2, \"Layers\": 0}", "m.json"));
        Assert.Contains("Layers", invalid.Message);
        var missing = Assert.Throws<FormatException>(() => ClassifierConfig.FromJson("{\"Classes\": 2}", "m.json"));
        Assert.Contains("VocabularySize", missing.Message);
        Assert.Throws<FormatException>(() => ClassifierConfig.FromJson("{\"VocabularySize\": 5, \"Classes\": 2, \"Cell\": \"Transformer\"}"));
        Assert.Throws<ArgumentException>(() => new ClassifierConfig(5, 2, HeadDropout: 1.0).Build());
    }

    [Fact]
    public void Embedding_matrix_is_a_detached_copy_with_a_zero_pad_row()
    {
        var model = new ClassifierConfig(11, 2, EmbeddingSize: 3).Build();
        using var matrix = model.EmbeddingMatrix();
        Assert.Equal(new long[] { 11, 3 }, matrix.shape);
        Assert.False(matrix.requires_grad);
        Assert.Equal(0f, matrix[BatchBuilder.PadId].abs().sum().item<float>());
        matrix.fill_(7);
        using var again = model.EmbeddingMatrix();
        Assert.NotEqual(7f, again[2, 0].item<float>());
    }

    [Fact]
    public void Left_padded_input_gives_the_right_padded_logits_and_is_refused_by_plain_forward()
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(CellKind.Gru, true, true, pooling: PoolingKind.Attention), seed: 4);
        using var right = ModelProbe.Batch(set);
        using var left = ModelProbe.Batch(set, PadSide.Left);
        using var a = model.forward(right.Tokens, right.Lengths);
        using var b = model.Logits(left.Tokens, left.Lengths, PadSide.Left);
        Assert.Equal(new long[] { set.Count, 3 }, a.shape);
        Assert.True((a - b).abs().max().item<float>() < 1e-6);
        Assert.Contains("left-padded", Assert.Throws<ArgumentException>(() => model.forward(left.Tokens, left.Lengths)).Message);
        Assert.Throws<ArgumentException>(() => model.forward(right.Tokens, torch.tensor(new long[] { 1 })));
    }

    [Theory]
    [InlineData(PoolingKind.Last, HeadKind.Linear)]
    [InlineData(PoolingKind.Attention, HeadKind.Mlp)]
    public void One_training_step_reaches_every_parameter_and_lowers_the_loss(PoolingKind pooling, HeadKind head)
    {
        var config = new ClassifierConfig(ModelProbe.Vocab, 3, CellKind.Lstm, 5, 6, 2, true, 0, 0, 0, pooling, head, 5);
        var (model, set) = ModelProbe.Create(config, seed: 12, rows: 16);
        model.train();
        using var batch = ModelProbe.Batch(set);
        using var optimizer = optim.SGD(model.parameters(), 0.5);
        float first = 0;
        for (int step = 0; step < 5; step++)
        {
            using var scope = torch.NewDisposeScope();
            optimizer.zero_grad();
            var loss = nn.functional.cross_entropy(model.forward(batch.Tokens, batch.Lengths), batch.Labels);
            loss.backward();
            if (step == 0)
            {
                first = loss.item<float>();
                foreach (var (name, p) in model.named_parameters())
                {
                    Assert.NotNull(p.grad);
                    Assert.True(p.grad!.abs().sum().item<float>() > 0, $"no gradient reached {name}");
                }
            }
            optimizer.step();
        }
        using var final = nn.functional.cross_entropy(model.forward(batch.Tokens, batch.Lengths), batch.Labels);
        Assert.True(final.item<float>() < first, $"loss {first} → {final.item<float>()}");
    }

    [Fact]
    public void Dropout_acts_in_training_mode_only()
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(CellKind.Gru, false, true) with { EmbeddingDropout = 0.5, HeadDropout = 0.5 }, seed: 2);
        using var batch = ModelProbe.Batch(set);
        using var e1 = model.forward(batch.Tokens, batch.Lengths);
        using var e2 = model.forward(batch.Tokens, batch.Lengths);
        Assert.Equal(0f, (e1 - e2).abs().max().item<float>());
        model.train();
        using var t1 = model.forward(batch.Tokens, batch.Lengths);
        using var t2 = model.forward(batch.Tokens, batch.Lengths);
        Assert.True((t1 - t2).abs().max().item<float>() > 0);
    }

    [Fact]
    public void Cpu_is_the_default_device_and_cuda_without_a_cuda_engine_fails_clearly()
    {
        Assert.Equal(DeviceType.CPU, ComputeDevice.Resolve("cpu").type);
        Assert.Equal(DeviceType.CPU, new ClassifierConfig(5, 2).Build().parameters().First().device_type);
        if (!torch.cuda.is_available())
            Assert.Contains("CUDA", Assert.Throws<ArgumentException>(() => ComputeDevice.Resolve("cuda")).Message);
        else
            Assert.Equal(DeviceType.CUDA, ComputeDevice.Resolve("cuda").type);
        Assert.Throws<ArgumentException>(() => ComputeDevice.Resolve("tpu"));
    }
}
