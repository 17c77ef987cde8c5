namespace Kit.Experiments;

/// <summary>Something that carries out one run of a sweep: this process, or a worker process it feeds.</summary>
public interface IRunExecutor
{
    RunRecord Execute(RunKey key, CancellationToken cancel);
}

/// <summary>Runs in this process (the engine's threads are set from the plan's training options).</summary>
public sealed class InProcessExecutor(Sweep sweep, IProgress<Kit.Training.TrainingProgress>? progress = null) : IRunExecutor
{
    public RunRecord Execute(RunKey key, CancellationToken cancel) => sweep.Execute(key, progress, cancel);
}
