using Kit.Batching;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Batching;

/// <summary>
/// Packed equals unpadded: for random batches in random length order, every row's outputs and final states
/// from one packed call equal running that row alone, unpadded, through the same engine cell.
/// </summary>
public class PackedRecurrenceTests
{
    public PackedRecurrenceTests() => TestEngine.Load();

    public static TheoryData<string, int, bool> Cells()
    {
        var data = new TheoryData<string, int, bool>();
        foreach (var kind in new[] { "gru", "lstm", "rnn" })
            foreach (var layers in new[] { 1, 2 })
                foreach (var bidirectional in new[] { false, true })
                    data.Add(kind, layers, bidirectional);
        return data;
    }

    static nn.Module Create(string kind, int input, int hidden, int layers, bool bidirectional) => kind switch
    {
        "gru" => nn.GRU(input, hidden, numLayers: layers, batchFirst: true, bidirectional: bidirectional),
        "lstm" => nn.LSTM(input, hidden, numLayers: layers, batchFirst: true, bidirectional: bidirectional),
        _ => nn.RNN(input, hidden, numLayers: layers, batchFirst: true, bidirectional: bidirectional),
    };

    [Theory]
    [MemberData(nameof(Cells))]
    public void Each_row_of_a_packed_batch_matches_the_row_run_alone(string kind, int layers, bool bidirectional)
    {
        const int input = 3, hidden = 4;
        torch.manual_seed(17);
        var cell = Create(kind, input, hidden, layers, bidirectional);
        cell.eval();
        var random = new Random(23 + layers);
        for (int trial = 0; trial < 8; trial++)
        {
            using var scope = torch.NewDisposeScope();
            int b = random.Next(1, 7);
            var lens = Enumerable.Range(0, b).Select(_ => (long)random.Next(1, 10)).ToArray();
            long steps = lens.Max() + random.Next(0, 3);              // sometimes longer than any row
            if (trial < 2)
            {
                // No padding at all: the dense fast path must give the same results as running rows alone.
                lens = Enumerable.Repeat((long)random.Next(1, 10), b).ToArray();
                steps = lens[0];
            }
            var x = torch.randn(b, steps, input);
            var result = PackedRecurrence.Run(cell, x, torch.tensor(lens));
            Assert.Equal(new long[] { b, steps, hidden * (bidirectional ? 2 : 1) }, result.Outputs.shape);
            Assert.Equal(new long[] { layers * (bidirectional ? 2 : 1), b, hidden }, result.FinalHidden.shape);
            Assert.Equal(kind == "lstm", result.FinalCell is not null);

            for (int i = 0; i < b; i++)
            {
                int len = (int)lens[i];
                var alone = x[i..(i + 1), ..len];
                Tensor outAlone, hAlone;
                Tensor? cAlone = null;
                switch (cell)
                {
                    case TorchSharp.Modules.LSTM lstm: (outAlone, hAlone, cAlone) = lstm.call(alone, null); break;
                    case TorchSharp.Modules.GRU gru: (outAlone, hAlone) = gru.call(alone, null); break;
                    default: (outAlone, hAlone) = ((TorchSharp.Modules.RNN)cell).call(alone, null); break;
                }
                AssertClose(outAlone[0], result.Outputs[i, ..len], $"outputs of row {i} (len {len})");
                AssertClose(hAlone[.., 0], result.FinalHidden[.., i], $"final hidden of row {i}");
                if (cAlone is not null) AssertClose(cAlone[.., 0], result.FinalCell![.., i], $"final cell of row {i}");
                if (len < steps)
                    Assert.Equal(0f, result.Outputs[i, len..].abs().max().item<float>());
            }
        }
    }

    [Fact]
    public void Lengths_outside_the_batch_are_refused()
    {
        var cell = nn.GRU(2, 3, batchFirst: true);
        using var x = torch.zeros(2, 4, 2);
        Assert.Throws<ArgumentException>(() => PackedRecurrence.Run(cell, x, torch.tensor(new long[] { 5, 1 })));
        Assert.Throws<ArgumentException>(() => PackedRecurrence.Run(cell, x, torch.tensor(new long[] { 0, 1 })));
        Assert.Throws<ArgumentException>(() => PackedRecurrence.Run(nn.Linear(2, 3), x, torch.tensor(new long[] { 2, 1 })));
    }

    internal static void AssertClose(Tensor expected, Tensor actual, string what, double tolerance = 1e-5)
    {
        Assert.Equal(expected.shape, actual.shape);
        double diff = (expected - actual).abs().max().item<float>();
        Assert.True(diff <= tolerance, $"{what}: max difference {diff:E2} > {tolerance:E0}");
    }
}
