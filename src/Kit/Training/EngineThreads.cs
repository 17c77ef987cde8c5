using TorchSharp;

namespace Kit.Training;

/// <summary>
/// Sets the engine's intra-op thread count once per process (0 = one per core). Interop threads are left at
/// the engine's default: changing them after the first parallel op is refused by libtorch.
/// </summary>
public static class EngineThreads
{
    static int _applied = -1;

    public static void Apply(int threads)
    {
        int wanted = threads > 0 ? threads : Environment.ProcessorCount;
        if (Interlocked.Exchange(ref _applied, wanted) == wanted) return;
        Kit.Native.Engine.EnsureLoaded();
        torch.set_num_threads(wanted);
    }
}
