using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Batching;

/// <summary>
/// Index tricks on padded batches [B, T, …] with per-row lengths. Each is one gather on the device, no loop
/// over rows or steps.
/// </summary>
public static class Alignment
{
    /// <summary>True at the first <c>length</c> steps of each row: bool [B, T] on <paramref name="device"/>.</summary>
    public static Tensor ValidMask(Tensor lengths, long steps, Device? device = null)
    {
        using var scope = torch.NewDisposeScope();
        var dev = device ?? lengths.device;
        var t = torch.arange(steps, ScalarType.Int64, dev).unsqueeze(0);
        return t.lt(lengths.to(dev).unsqueeze(1)).MoveToOuterDisposeScope();
    }

    /// <summary>Left-padded rows moved so their tokens start at step 0 (pads follow).</summary>
    public static Tensor LeftToRight(Tensor x, Tensor lengths) =>
        Gather(x, lengths, (t, len, steps) => t.add(steps).sub(len).remainder(steps));

    /// <summary>Right-padded rows moved so their tokens end at the last step (pads lead).</summary>
    public static Tensor RightToLeft(Tensor x, Tensor lengths) =>
        Gather(x, lengths, (t, len, steps) => t.add(len).remainder(steps));

    /// <summary>
    /// Each right-padded row's valid prefix reversed in place (pads stay at the end), so a forward pass over the
    /// result reads the row backwards without seeing a pad first. Its own inverse.
    /// </summary>
    public static Tensor ReverseValid(Tensor x, Tensor lengths) =>
        Gather(x, lengths, (t, len, _) => torch.where(t.lt(len), len.sub(1).sub(t), t));

    static Tensor Gather(Tensor x, Tensor lengths, Func<Tensor, Tensor, long, Tensor> source)
    {
        if (x.dim() < 2) throw new ArgumentException($"expected a batch [B, T, …], got {x.dim()} dimension(s)");
        if (lengths.dim() != 1 || lengths.shape[0] != x.shape[0])
            throw new ArgumentException($"lengths must be [B] = [{x.shape[0]}], got [{string.Join(", ", lengths.shape)}]");
        using var scope = torch.NewDisposeScope();
        long steps = x.shape[1];
        var t = torch.arange(steps, ScalarType.Int64, x.device).unsqueeze(0);
        var len = lengths.to(ScalarType.Int64).to(x.device).unsqueeze(1);
        var index = source(t, len, steps);                    // [B, T]
        for (int d = 2; d < x.dim(); d++) index = index.unsqueeze(-1);
        index = index.expand(x.shape);
        return x.gather(1, index).MoveToOuterDisposeScope();
    }
}
