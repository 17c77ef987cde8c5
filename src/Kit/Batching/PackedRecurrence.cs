using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;
using static TorchSharp.torch.nn.utils.rnn;

namespace Kit.Batching;

/// <summary>
/// What a recurrent cell returns for a padded batch: per-step outputs [B, T, H × directions] (zeros at pad
/// steps) and final states [layers × directions, B, H] in the engine's layout; <see cref="FinalCell"/> only for
/// LSTM. Rows are in the caller's order.
/// </summary>
public sealed record RecurrenceResult(Tensor Outputs, Tensor FinalHidden, Tensor? FinalCell) : IDisposable
{
    public void Dispose()
    {
        Outputs.Dispose();
        FinalHidden.Dispose();
        FinalCell?.Dispose();
    }
}

/// <summary>
/// Runs an engine GRU, LSTM or RNN (batch-first) over a right-padded batch through the engine's packed
/// sequences, so no step of any row reads a pad and each direction's final state is taken at that row's real
/// end. Rows may come in any length order: the engine sorts internally (enforce_sorted = false) and its
/// results are put back in the caller's order.
/// </summary>
public static class PackedRecurrence
{
    public static RecurrenceResult Run(nn.Module cell, Tensor embedded, Tensor lengths)
    {
        Kit.Native.Engine.EnsureLoaded();
        if (embedded.dim() != 3) throw new ArgumentException($"expected embedded input [B, T, E], got {embedded.dim()} dimension(s)");
        if (lengths.dim() != 1 || lengths.shape[0] != embedded.shape[0])
            throw new ArgumentException($"lengths must be [B] = [{embedded.shape[0]}], got [{string.Join(", ", lengths.shape)}]");

        using var scope = torch.NewDisposeScope();
        // The engine reads lengths on the CPU as int64.
        var cpuLengths = lengths.to(ScalarType.Int64).cpu();
        long steps = embedded.shape[1];
        if (cpuLengths.min().item<long>() < 1 || cpuLengths.max().item<long>() > steps)
            throw new ArgumentException($"every length must be in 1..{steps} (the batch's step count)");

        Tensor outputs, hidden;
        Tensor? cellState = null;
        // No row is padded: the dense call computes exactly what the packed one would, without the engine's
        // sort, gather and unpack around every batch (the common case for fixed-length codes and for length buckets).
        if (cpuLengths.min().item<long>() == steps)
        {
            switch (cell)
            {
                case GRU gru: (outputs, hidden) = gru.call(embedded, null); break;
                case LSTM lstm: { var (o, h, c) = DenseLstm(lstm, embedded); outputs = o; hidden = h; cellState = c; break; }
                case RNN rnn: (outputs, hidden) = rnn.call(embedded, null); break;
                default: throw new ArgumentException($"PackedRecurrence runs GRU, LSTM or RNN modules, not {cell.GetType().Name}");
            }
            return new RecurrenceResult(outputs.MoveToOuterDisposeScope(), hidden.MoveToOuterDisposeScope(), cellState?.MoveToOuterDisposeScope());
        }

        using var packed = pack_padded_sequence(embedded, cpuLengths, batch_first: true, enforce_sorted: false);
        switch (cell)
        {
            case GRU gru:
                {
                    var (po, h) = gru.call(packed, null);
                    using (po) outputs = Unpack(po, steps);
                    hidden = h;
                    break;
                }
            case LSTM lstm:
                {
                    var (po, h, c) = lstm.call(packed, null);
                    using (po) outputs = Unpack(po, steps);
                    hidden = h;
                    cellState = c;
                    break;
                }
            case RNN rnn:
                {
                    var (po, h) = rnn.call(packed, null);
                    using (po) outputs = Unpack(po, steps);
                    hidden = h;
                    break;
                }
            default:
                throw new ArgumentException($"PackedRecurrence runs GRU, LSTM or RNN modules, not {cell.GetType().Name}");
        }
        return new RecurrenceResult(outputs.MoveToOuterDisposeScope(), hidden.MoveToOuterDisposeScope(), cellState?.MoveToOuterDisposeScope());
    }

    /// <summary>Runs the cell over a padded batch as is (no packing): outputs only, caller's order.</summary>
    public static Tensor RunPadded(nn.Module cell, Tensor embedded)
    {
        Kit.Native.Engine.EnsureLoaded();
        using var scope = torch.NewDisposeScope();
        Tensor outputs = cell switch
        {
            GRU gru => gru.call(embedded, null).Item1,
            LSTM lstm => DenseLstm(lstm, embedded).Outputs,
            RNN rnn => rnn.call(embedded, null).Item1,
            _ => throw new ArgumentException($"RunPadded runs GRU, LSTM or RNN modules, not {cell.GetType().Name}"),
        };
        return outputs.MoveToOuterDisposeScope();
    }

    /// <summary>
    /// An LSTM over every step of every row. Under no_grad the engine's dense (unpacked) CPU LSTM call departs from
    /// the LSTM equations (TorchSharp 0.107; seen from the first step, by hand and against ONNX Runtime), while its
    /// packed call does not, so the dense case goes through a packing with every row at full length: the same result.
    /// </summary>
    static (Tensor Outputs, Tensor Hidden, Tensor Cell) DenseLstm(LSTM lstm, Tensor embedded)
    {
        if (torch.is_grad_enabled())
        {
            var (o, h, c) = lstm.call(embedded, null);
            return (o, h, c);
        }
        long rows = embedded.shape[0], steps = embedded.shape[1];
        using var full = torch.full(rows, steps, dtype: ScalarType.Int64);
        using var packed = pack_padded_sequence(embedded, full, batch_first: true, enforce_sorted: true);
        var (po, hidden, cell) = lstm.call(packed, null);
        using (po) return (Unpack(po, steps), hidden, cell);
    }

    static Tensor Unpack(PackedSequence packed, long steps)
    {
        var (padded, lens) = pad_packed_sequence(packed, batch_first: true, padding_value: 0.0, total_length: steps);
        lens.Dispose();
        return padded;
    }
}
