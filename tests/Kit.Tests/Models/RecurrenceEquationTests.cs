using Kit.Batching;
using Kit.Models;
using TorchSharp;

namespace Kit.Tests.Models;

/// <summary>
/// The encoder's outputs recomputed by hand from the published cell equations (see <see cref="HandRecurrence"/>
/// for the sources) with the module's own weights: two stacked layers, each direction, packed and unpacked.
/// </summary>
public class RecurrenceEquationTests
{
    public static TheoryData<CellKind, bool, bool> Cases()
    {
        var data = new TheoryData<CellKind, bool, bool>();
        foreach (var cell in Enum.GetValues<CellKind>())
            foreach (var bidirectional in new[] { false, true })
                foreach (var packed in new[] { true, false })
                    data.Add(cell, bidirectional, packed);
        return data;
    }

    static double[][] RunLayer(CellKind kind, CellWeights w, IReadOnlyList<double[]> xs) => kind switch
    {
        CellKind.Gru => HandRecurrence.Gru(w, xs),
        CellKind.Lstm => HandRecurrence.Lstm(w, xs).Outputs,
        _ => HandRecurrence.Elman(w, xs),
    };

    /// <summary>Both layers by hand: forward over the row, backward over the reversed row, outputs concatenated per step.</summary>
    static List<double[]> ByHand(SequenceClassifier model, IReadOnlyList<double[]> embedded)
    {
        var config = model.Config;
        var x = embedded.ToList();
        for (int layer = 0; layer < config.Layers; layer++)
        {
            var forward = RunLayer(config.Cell, ModelProbe.Weights(model, layer, 0), x);
            if (!config.Bidirectional) { x = forward.ToList(); continue; }
            var backward = RunLayer(config.Cell, ModelProbe.Weights(model, layer, 1), x.AsEnumerable().Reverse().ToList()).Reverse().ToArray();
            x = forward.Zip(backward, (f, b) => f.Concat(b).ToArray()).ToList();
        }
        return x;
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Encoder_outputs_match_the_cell_equations_computed_by_hand(CellKind cell, bool bidirectional, bool packed)
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(cell, bidirectional, packed, layers: 2), seed: 5);
        using var batch = ModelProbe.Batch(set);
        using var outputs = model.Encode(batch.Tokens, batch.Lengths);
        for (int row = 0; row < set.Count; row++)
        {
            var expected = ByHand(model, ModelProbe.Embedded(model, set, row));
            for (int t = 0; t < expected.Count; t++)
                ModelProbe.Close(expected[t], ModelProbe.Row(outputs[row, t]), $"{cell} row {row} step {t}");
        }
    }

    [Fact]
    public void Lstm_final_cell_state_from_packing_matches_the_hand_recurrence()
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(CellKind.Lstm, bidirectional: true, packed: true), seed: 9);
        using var batch = ModelProbe.Batch(set);
        using var scope = torch.NewDisposeScope();
        var embedded = torch.tensor(Enumerable.Range(0, set.Count).SelectMany(r =>
        {
            var rows = ModelProbe.Embedded(model, set, r);
            while (rows.Count < batch.Steps) rows.Add(new double[model.Config.EmbeddingSize]);
            return rows.SelectMany(v => v.Select(d => (float)d));
        }).ToArray(), new long[] { set.Count, batch.Steps, model.Config.EmbeddingSize });
        using var result = PackedRecurrence.Run(model.Encoder.FusedCell!, embedded, batch.Lengths);
        for (int row = 0; row < set.Count; row++)
        {
            var xs = ModelProbe.Embedded(model, set, row);
            var (_, forwardCell) = HandRecurrence.Lstm(ModelProbe.Weights(model, 0, 0), xs);
            var (_, backwardCell) = HandRecurrence.Lstm(ModelProbe.Weights(model, 0, 1), xs.AsEnumerable().Reverse().ToList());
            ModelProbe.Close(forwardCell, ModelProbe.Row(result.FinalCell![0, row]), $"forward c of row {row}");
            ModelProbe.Close(backwardCell, ModelProbe.Row(result.FinalCell![1, row]), $"backward c of row {row}");
        }
    }
}
