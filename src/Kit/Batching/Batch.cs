using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Batching;

/// <summary>
/// One padded batch. Tokens, Mask and Labels live on <see cref="Device"/>; Lengths always stays on the CPU
/// because the engine's packing reads it there. Pad id is <see cref="BatchBuilder.PadId"/>.
/// </summary>
public sealed class Batch : IDisposable
{
    /// <summary>Token ids, int64 [B, T].</summary>
    public Tensor Tokens { get; }
    /// <summary>Valid steps per row, int64 [B], on the CPU.</summary>
    public Tensor Lengths { get; }
    /// <summary>True at real-token positions, bool [B, T].</summary>
    public Tensor Mask { get; }
    /// <summary>Class ids, int64 [B].</summary>
    public Tensor Labels { get; }
    /// <summary>Indices of the rows in the <see cref="Kit.Data.EncodedSet"/> the batch was built from, in batch order.</summary>
    public int[] Rows { get; }
    public PadSide Side { get; }
    /// <summary>Real (non-pad) positions in the batch.</summary>
    public int RealTokens { get; }
    /// <summary>Pad positions in the batch, so RealTokens + PaddedTokens = B × T.</summary>
    public int PaddedTokens { get; }
    public int Size => Rows.Length;
    public int Steps { get; }
    public int Positions => Size * Steps;
    public Device Device => Tokens.device;

    internal Batch(Tensor tokens, Tensor lengths, Tensor mask, Tensor labels, int[] rows, PadSide side, int realTokens, int steps)
    {
        Tokens = tokens; Lengths = lengths; Mask = mask; Labels = labels; Rows = rows; Side = side;
        RealTokens = realTokens; Steps = steps;
        PaddedTokens = rows.Length * steps - realTokens;
    }

    /// <summary>
    /// The batch on <paramref name="device"/>. Returns this same object when it is already there; otherwise a new
    /// batch owning new tensors (both must be disposed).
    /// </summary>
    public Batch To(Device device)
    {
        if (device.type == Tokens.device.type && device.index == Tokens.device.index) return this;
        return new Batch(Tokens.to(device), Lengths.clone(), Mask.to(device), Labels.to(device), Rows, Side, RealTokens, Steps);
    }

    public void Dispose()
    {
        Tokens.Dispose();
        Lengths.Dispose();
        Mask.Dispose();
        Labels.Dispose();
    }
}
