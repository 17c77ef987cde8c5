using Kit.Batching;
using Kit.Models;
using Kit.Tests.Batching;
using TorchSharp;

namespace Kit.Tests.Models;

/// <summary>
/// With gradients off (how scoring and validation run) an LSTM over a batch with no padding, or an unpacked LSTM,
/// still follows the cell equations (<see cref="HandRecurrence"/>). The engine's dense LSTM call takes another
/// CPU kernel without gradients whose outputs differ by several hundredths; the encoder must not use it.
/// </summary>
public class LstmInferenceTests
{
    [Theory]
    [InlineData(true, false)]
    [InlineData(false, false)]
    [InlineData(false, true)]
    public void Lstm_outputs_without_gradients_follow_the_equations_on_unpadded_batches(bool packed, bool bidirectional)
    {
        TestEngine.Load();
        torch.manual_seed(5);
        var model = ModelProbe.Config(CellKind.Lstm, bidirectional, packed, layers: 1).Build();
        model.eval();
        var set = TestEngine.RandomSet(new[] { 7, 7, 7 }, ModelProbe.Vocab, 3, 5);
        using var batch = ModelProbe.Batch(set);
        using var noGrad = torch.no_grad();
        using var outputs = model.Encode(batch.Tokens, batch.Lengths);
        for (int row = 0; row < set.Count; row++)
        {
            var xs = ModelProbe.Embedded(model, set, row);
            var forward = HandRecurrence.Lstm(ModelProbe.Weights(model, 0, 0), xs).Outputs;
            for (int t = 0; t < xs.Count; t++)
                ModelProbe.Close(forward[t], ModelProbe.Row(outputs[row, t]).Take(4).ToArray(), $"row {row} step {t} forward");
            if (!bidirectional) continue;
            var backward = HandRecurrence.Lstm(ModelProbe.Weights(model, 0, 1), xs.AsEnumerable().Reverse().ToList()).Outputs.Reverse().ToArray();
            for (int t = 0; t < xs.Count; t++)
                ModelProbe.Close(backward[t], ModelProbe.Row(outputs[row, t]).Skip(4).ToArray(), $"row {row} step {t} backward");
        }
    }
}
