using Kit.Batching;
using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Models;

/// <summary>
/// The recurrent part of a classifier: embedded right-padded batch [B, T, E] and lengths in, per-step outputs
/// [B, T, H × directions] out (forward half first, as the engine lays them out).
///
/// Packed mode hands the whole stack to one fused engine cell over packed sequences. Unpacked mode runs the
/// padded batch directly: pads trail every row, so a forward pass reaches each valid step before any pad; a
/// backward pass would read the pads first, so bidirectional unpacked stacks run each direction as its own
/// one-layer cell and feed the backward one the rows with their valid part reversed in place.
/// </summary>
public sealed class RecurrentEncoder : nn.Module<Tensor, Tensor, Tensor>
{
    readonly ModuleList<nn.Module> cells;
    readonly Dropout layerDropout;
    readonly bool _split;
    readonly bool _packed;

    public RecurrentEncoder(ClassifierConfig config) : base(nameof(RecurrentEncoder))
    {
        _packed = config.Packed;
        _split = !config.Packed && config.Bidirectional;
        cells = new ModuleList<nn.Module>();
        if (_split)
        {
            for (int layer = 0; layer < config.Layers; layer++)
            {
                long input = layer == 0 ? config.EmbeddingSize : config.PooledSize;
                cells.Add(CreateCell(config.Cell, input, config.HiddenSize, 1, 0, false));
                cells.Add(CreateCell(config.Cell, input, config.HiddenSize, 1, 0, false));
            }
        }
        else
        {
            // The engine applies its dropout between stacked layers only, so one layer gets none.
            double dropout = config.Layers > 1 ? config.LayerDropout : 0;
            cells.Add(CreateCell(config.Cell, config.EmbeddingSize, config.HiddenSize, config.Layers, dropout, config.Bidirectional));
        }
        layerDropout = nn.Dropout(config.LayerDropout);
        RegisterComponents();
    }

    /// <summary>The fused engine cell (packed, or unpacked unidirectional); null for split bidirectional stacks.</summary>
    public nn.Module? FusedCell => _split ? null : cells[0];

    /// <summary>Cell of one layer and direction (0 forward, 1 backward) in a split stack.</summary>
    public nn.Module SplitCell(int layer, int direction) =>
        _split ? cells[2 * layer + direction] : throw new InvalidOperationException("this encoder uses one fused cell");

    public override Tensor forward(Tensor embedded, Tensor lengths)
    {
        if (!_split)
        {
            if (!_packed) return PackedRecurrence.RunPadded(cells[0], embedded);
            using var result = PackedRecurrence.Run(cells[0], embedded, lengths);
            return result.Outputs.alias();
        }

        using var scope = torch.NewDisposeScope();
        var x = embedded;
        int layers = cells.Count / 2;
        for (int layer = 0; layer < layers; layer++)
        {
            if (layer > 0) x = layerDropout.call(x);
            var forwardOut = PackedRecurrence.RunPadded(cells[2 * layer], x);
            var backwardOut = Alignment.ReverseValid(PackedRecurrence.RunPadded(cells[2 * layer + 1], Alignment.ReverseValid(x, lengths)), lengths);
            x = torch.cat(new[] { forwardOut, backwardOut }, 2);
        }
        return x.MoveToOuterDisposeScope();
    }

    static nn.Module CreateCell(CellKind kind, long input, long hidden, long layers, double dropout, bool bidirectional) => kind switch
    {
        CellKind.Gru => nn.GRU(input, hidden, numLayers: layers, batchFirst: true, dropout: dropout, bidirectional: bidirectional),
        CellKind.Lstm => nn.LSTM(input, hidden, numLayers: layers, batchFirst: true, dropout: dropout, bidirectional: bidirectional),
        // The engine's RNN defaults to tanh, the plain Elman cell.
        CellKind.Rnn => nn.RNN(input, hidden, numLayers: layers, batchFirst: true, dropout: dropout, bidirectional: bidirectional),
        _ => throw new ArgumentOutOfRangeException(nameof(kind), kind, "unknown cell"),
    };
}
