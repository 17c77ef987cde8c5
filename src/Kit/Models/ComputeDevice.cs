using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Models;

/// <summary>
/// Names a compute device. The kit ships with the CPU engine and never needs a GPU; "cuda" works only when the
/// application references a CUDA build of TorchSharp and a GPU is present, and otherwise fails with a clear error.
/// </summary>
public static class ComputeDevice
{
    public const string Cpu = "cpu";

    public static Device Resolve(string name)
    {
        Kit.Native.Engine.EnsureLoaded();
        if (string.IsNullOrWhiteSpace(name) || name.Equals(Cpu, StringComparison.OrdinalIgnoreCase)) return torch.CPU;
        if (name.StartsWith("cuda", StringComparison.OrdinalIgnoreCase))
        {
            if (!torch.cuda.is_available())
                throw new ArgumentException(
                    $"device '{name}' was requested, but the engine has no usable CUDA (this kit references TorchSharp-cpu). " +
                    "Use \"cpu\", or reference a CUDA build of TorchSharp on a machine with a GPU.");
            return torch.device(name.ToLowerInvariant());
        }
        throw new ArgumentException($"unknown device '{name}'; use \"cpu\" or \"cuda\" / \"cuda:N\"");
    }
}
