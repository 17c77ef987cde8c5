using Kit.Batching;
using Kit.Models;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Models;

/// <summary>
/// Hot paths leave no engine tensor behind: after a warm-up step (which creates the gradients that then live
/// with the parameters), repeated build → forward → backward steps inside a dispose scope keep this thread's
/// live tensor count where it was.
/// </summary>
public class TensorLifetimeTests
{
    [Theory]
    [InlineData(CellKind.Lstm, true, PoolingKind.Attention)]
    [InlineData(CellKind.Gru, false, PoolingKind.Last)]
    [InlineData(CellKind.Rnn, false, PoolingKind.Max)]
    public void Training_steps_keep_the_live_tensor_count_flat(CellKind cell, bool packed, PoolingKind pooling)
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(cell, bidirectional: true, packed, layers: 2, pooling: pooling), seed: 6, rows: 12);
        model.train();
        var rows = Enumerable.Range(0, set.Count).ToArray();
        void Step(PadSide side)
        {
            using var scope = torch.NewDisposeScope();
            using var batch = BatchBuilder.Build(set, rows, new PaddingOptions(Side: side));
            model.zero_grad();
            var loss = nn.functional.cross_entropy(model.Logits(batch.Tokens, batch.Lengths, side), batch.Labels);
            loss.backward();
        }
        Step(PadSide.Right);
        long before = DisposeScopeManager.Statistics.ThreadTotalLiveCount;
        for (int i = 0; i < 6; i++) Step(i % 2 == 0 ? PadSide.Right : PadSide.Left);
        Assert.Equal(before, DisposeScopeManager.Statistics.ThreadTotalLiveCount);
    }
}
