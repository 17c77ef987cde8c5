using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>The global L2 norm of all gradients, and clipping by it (the same rule as the engine's clip_grad_norm_).</summary>
public static class GradientNorm
{
    /// <summary>‖g‖₂ over every parameter's gradient taken together, as a scalar tensor (no read-back, so the caller can batch it with others).</summary>
    public static Tensor TotalTensor(IReadOnlyList<Tensor> parameters)
    {
        using var scope = torch.NewDisposeScope();
        var norms = parameters.Select(p => p.grad).Where(g => g is not null).Select(g => g!.norm()).ToArray();
        var total = norms.Length == 0 ? torch.zeros(1).squeeze() : torch.stack(norms).norm();
        return total.MoveToOuterDisposeScope();
    }

    /// <summary>‖g‖₂ as a number; NaN or ∞ when any gradient entry is.</summary>
    public static double Total(IReadOnlyList<Tensor> parameters)
    {
        using var t = TotalTensor(parameters);
        return t.item<float>();
    }

    /// <summary>
    /// Scales every gradient by max / (‖g‖ + 1e-6) when ‖g‖ exceeds <paramref name="maxNorm"/>; returns ‖g‖ before
    /// clipping. A non-finite norm is left alone for the caller to report.
    /// </summary>
    public static double Clip(IReadOnlyList<Tensor> parameters, double maxNorm)
    {
        double total = Total(parameters);
        if (double.IsFinite(total) && total > maxNorm) Scale(parameters, maxNorm / (total + 1e-6));
        return total;
    }

    internal static void Scale(IReadOnlyList<Tensor> parameters, double factor)
    {
        using var noGrad = torch.no_grad();
        foreach (var p in parameters) p.grad?.mul_(factor);
    }
}
