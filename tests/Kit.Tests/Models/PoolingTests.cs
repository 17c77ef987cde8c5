using Kit.Batching;
using Kit.Models;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Models;

public class PoolingTests
{
    public static TheoryData<CellKind, PoolingKind, bool, bool> AllCombinations()
    {
        var data = new TheoryData<CellKind, PoolingKind, bool, bool>();
        foreach (var cell in Enum.GetValues<CellKind>())
            foreach (var pooling in Enum.GetValues<PoolingKind>())
                foreach (var bidirectional in new[] { false, true })
                    foreach (var packed in new[] { true, false })
                        data.Add(cell, pooling, bidirectional, packed);
        return data;
    }

    /// <summary>Masks hold: whatever ids sit in the pad positions, no pooled output moves.</summary>
    [Theory]
    [MemberData(nameof(AllCombinations))]
    public void Values_in_pad_positions_change_no_pooled_output(CellKind cell, PoolingKind pooling, bool bidirectional, bool packed)
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(cell, bidirectional, packed, layers: 2, pooling: pooling), seed: 13, rows: 8);
        foreach (var side in new[] { PadSide.Right, PadSide.Left })
        {
            using var scope = torch.NewDisposeScope();
            using var batch = ModelProbe.Batch(set, side);
            Assert.True(batch.PaddedTokens > 0);
            var noise = torch.randint(2, ModelProbe.Vocab, batch.Tokens.shape, dtype: ScalarType.Int64);
            var scrambled = torch.where(batch.Mask, batch.Tokens, noise);
            Assert.True(scrambled.ne(batch.Tokens).any().item<bool>());

            var clean = model.Pooled(batch.Tokens, batch.Lengths, side);
            var dirty = model.Pooled(scrambled, batch.Lengths, side);
            Assert.Equal(0f, (clean - dirty).abs().max().item<float>(), 6);

            // The same kind of change at real positions must show, or the check above proves nothing.
            var shifted = batch.Tokens.sub(2).add(1).remainder(ModelProbe.Vocab - 2).add(2);
            var rowZero = torch.zeros_like(batch.Mask);
            rowZero[0] = torch.tensor(true);
            var touched = torch.where(batch.Mask.logical_and(rowZero), shifted, batch.Tokens);
            var moved = model.Pooled(touched, batch.Lengths, side);
            Assert.True((clean[0] - moved[0]).abs().max().item<float>() > 1e-6, "a real token change did not reach the pooled output");
        }
    }

    [Theory]
    [InlineData(CellKind.Gru)]
    [InlineData(CellKind.Lstm)]
    [InlineData(CellKind.Rnn)]
    public void Last_pooling_equals_each_directions_final_state_from_packing(CellKind cell)
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(cell, bidirectional: true, packed: true, layers: 2), seed: 21);
        using var batch = ModelProbe.Batch(set);
        using var scope = torch.NewDisposeScope();
        var pooled = model.Pooled(batch.Tokens, batch.Lengths);
        // Embedding rows for the batch, zero at pads (pad id's embedding row is zero).
        var embedded = model.EmbeddingMatrix().index_select(0, batch.Tokens.flatten()).view(batch.Size, batch.Steps, -1);
        using var result = PackedRecurrence.Run(model.Encoder.FusedCell!, embedded, batch.Lengths);
        // Engine layout: [layers × directions, B, H], the last layer's forward then backward.
        var expected = torch.cat(new[] { result.FinalHidden[2], result.FinalHidden[3] }, 1);
        Assert.True((expected - pooled).abs().max().item<float>() < 1e-6);
    }

    [Theory]
    [MemberData(nameof(AllCombinations))]
    public void Unpacked_encoding_gives_the_packed_result_with_the_same_weights(CellKind cell, PoolingKind pooling, bool bidirectional, bool packed)
    {
        if (!packed) return;   // each pair is checked once, from its packed side
        var (packedModel, set) = ModelProbe.Create(ModelProbe.Config(cell, bidirectional, true, layers: 2, pooling: pooling), seed: 31);
        torch.manual_seed(99);
        var paddedModel = (packedModel.Config with { Packed = false }).Build();
        paddedModel.eval();
        CopyWeights(packedModel, paddedModel);
        using var batch = ModelProbe.Batch(set);
        using var scope = torch.NewDisposeScope();
        var a = packedModel.forward(batch.Tokens, batch.Lengths);
        var b = paddedModel.forward(batch.Tokens, batch.Lengths);
        Assert.True((a - b).abs().max().item<float>() < 1e-5);
    }

    /// <summary>Copies parameters by name; split stacks take "cells.{2l+d}.x_l0" from fused "cells.0.x_l{l}[_reverse]".</summary>
    static void CopyWeights(SequenceClassifier from, SequenceClassifier to)
    {
        var source = from.state_dict();
        using var noGrad = torch.no_grad();
        foreach (var (name, value) in to.state_dict())
        {
            string key = name;
            var m = System.Text.RegularExpressions.Regex.Match(name, @"^encoder\.cells\.(\d+)\.(\w+)_l0$");
            if (m.Success && to.Encoder.FusedCell is null)
            {
                int index = int.Parse(m.Groups[1].Value);
                key = $"encoder.cells.0.{m.Groups[2].Value}_l{index / 2}" + (index % 2 == 1 ? "_reverse" : "");
            }
            value.copy_(source[key]);
        }
    }

    [Fact]
    public void Mean_and_max_pooling_agree_with_a_direct_computation_over_valid_steps()
    {
        var (meanModel, set) = ModelProbe.Create(ModelProbe.Config(CellKind.Gru, true, true, pooling: PoolingKind.Mean), seed: 3);
        using var batch = ModelProbe.Batch(set);
        using var outputs = meanModel.Encode(batch.Tokens, batch.Lengths);
        using var mean = meanModel.Pooled(batch.Tokens, batch.Lengths);
        var max = new SequencePooling(meanModel.Config with { Pooling = PoolingKind.Max }).call(outputs, batch.Lengths);
        var lengths = batch.Lengths.data<long>().ToArray();
        for (int row = 0; row < set.Count; row++)
        {
            int len = (int)lengths[row];
            var steps = Enumerable.Range(0, len).Select(t => ModelProbe.Row(outputs[row, t])).ToList();
            var expectedMean = Enumerable.Range(0, steps[0].Length).Select(k => steps.Average(s => (double)s[k])).ToArray();
            var expectedMax = Enumerable.Range(0, steps[0].Length).Select(k => (double)steps.Max(s => s[k])).ToArray();
            ModelProbe.Close(expectedMean, ModelProbe.Row(mean[row]), $"mean of row {row}", 1e-6);
            ModelProbe.Close(expectedMax, ModelProbe.Row(max[row]), $"max of row {row}", 0);
        }
    }

    [Fact]
    public void Attention_weights_are_a_distribution_over_valid_steps_only()
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(CellKind.Lstm, false, true, pooling: PoolingKind.Attention), seed: 8);
        using var batch = ModelProbe.Batch(set);
        using var outputs = model.Encode(batch.Tokens, batch.Lengths);
        using var weights = model.Pooling.AttentionWeights(outputs, batch.Lengths);
        using var sums = weights.sum(1);
        Assert.All(sums.data<float>().ToArray(), s => Assert.Equal(1f, s, 5));
        Assert.Equal(0f, weights.masked_select(batch.Mask.logical_not()).abs().sum().item<float>());
        // The pooled vector is the weighted sum of outputs.
        using var pooled = model.Pooled(batch.Tokens, batch.Lengths);
        using var direct = weights.unsqueeze(-1).mul(outputs.masked_fill(batch.Mask.logical_not().unsqueeze(-1), 0)).sum(1);
        Assert.True((pooled - direct).abs().max().item<float>() < 1e-6);
    }
}
