using Kit.Models;
using TorchSharp;

namespace Kit.Tests.Models;

/// <summary>
/// Scoring runs the encoder under no_grad, where the engine's dense CPU LSTM call (TorchSharp 0.107) departs from
/// the LSTM equations; the kit routes it through packing (see PackedRecurrence). Checked by hand from the
/// published cell equations (sources in <see cref="HandRecurrence"/>), for every cell, packed and unpacked, and for
/// batches with and without padded rows.
/// </summary>
public class NoGradRecurrenceTests
{
    public static TheoryData<CellKind, bool, bool> Cases()
    {
        var data = new TheoryData<CellKind, bool, bool>();
        foreach (var cell in Enum.GetValues<CellKind>())
            foreach (var packed in new[] { true, false })
                foreach (var equalLengths in new[] { true, false })
                    data.Add(cell, packed, equalLengths);
        return data;
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Encoder_outputs_under_no_grad_match_the_cell_equations(CellKind cell, bool packed, bool equalLengths)
    {
        var (model, set) = ModelProbe.Create(ModelProbe.Config(cell, bidirectional: false, packed), seed: 21, rows: 8, maxLength: 9);
        if (equalLengths)
        {
            // Every row the same length: the batch has no padded row, which takes the engine's dense call.
            var rows = Enumerable.Range(0, set.Count).Where(r => set.Length(r) >= 4).Take(4).ToArray();
            set = Kit.Data.EncodedSet.FromSequences(rows.Select(r => set[r][..4].ToArray()).ToArray(), new int[rows.Length]);
        }
        model.eval();
        using var noGrad = torch.no_grad();
        using var batch = ModelProbe.Batch(set);
        using var outputs = model.Encode(batch.Tokens, batch.Lengths);
        for (int row = 0; row < set.Count; row++)
        {
            var xs = ModelProbe.Embedded(model, set, row);
            var w = ModelProbe.Weights(model, 0, 0);
            var expected = cell switch
            {
                CellKind.Gru => HandRecurrence.Gru(w, xs),
                CellKind.Lstm => HandRecurrence.Lstm(w, xs).Outputs,
                _ => HandRecurrence.Elman(w, xs),
            };
            for (int t = 0; t < expected.Length; t++)
                ModelProbe.Close(expected[t], ModelProbe.Row(outputs[row, t]), $"{cell} row {row} step {t}");
        }
    }
}
