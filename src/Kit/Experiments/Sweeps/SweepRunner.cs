using System.Collections.Concurrent;
using Kit.Common;

namespace Kit.Experiments;

/// <summary>After each finished run: how far the sweep (this shard of it) has come.</summary>
public sealed record SweepProgress(int Finished, int Pending, int AlreadyDone, RunRecord Record);

/// <summary>What one call of <see cref="SweepRunner.Run"/> did.</summary>
public sealed record SweepOutcome(int Owned, int AlreadyDone, int Ran, string StoreFile, IReadOnlyList<string> Notes);

/// <summary>
/// Runs the share of a sweep that a shard owns and the store does not yet hold, each finished run appended to the
/// shard's store file the moment it ends. Several executors (worker processes) take runs from one queue, so a
/// slow config does not hold up the rest; only this process writes the file.
/// </summary>
public static class SweepRunner
{
    public static SweepOutcome Run(Sweep sweep, string dir, Shard? shard = null, IReadOnlyList<IRunExecutor>? executors = null,
        IProgress<SweepProgress>? progress = null, CancellationToken cancel = default)
    {
        shard ??= Shard.Whole;
        CheckDefinition(sweep, dir);
        var owned = sweep.Plan.Runs().Where((_, i) => shard.Owns(i)).ToArray();
        var before = ResultsStore.Read(dir);
        var finished = before.FinishedIds;
        var pending = owned.Where(k => !finished.Contains(k.Id)).ToArray();
        int already = owned.Length - pending.Length;
        string file = Path.Combine(dir, shard.FileName);
        var notes = before.Notes.ToList();
        using var writer = new ResultsWriter(file);
        if (writer.RepairedBytes > 0) notes.Add($"{file}: removed a torn final line of {writer.RepairedBytes} bytes before appending");
        executors ??= [new InProcessExecutor(sweep)];
        var queue = new ConcurrentQueue<RunKey>(pending);
        int done = 0;
        using var stop = CancellationTokenSource.CreateLinkedTokenSource(cancel);
        var tasks = executors.Select(executor => Task.Run(() =>
        {
            try
            {
                while (!stop.IsCancellationRequested && queue.TryDequeue(out var key))
                {
                    var record = executor.Execute(key, stop.Token) with { Shard = shard.IsWhole ? null : shard.ToString() };
                    if (record.Id != key.Id) throw new InvalidOperationException($"asked for run {key.Id} but got {record.Id}");
                    writer.Append(record);
                    int finishedNow = Interlocked.Increment(ref done);
                    progress?.Report(new SweepProgress(finishedNow, pending.Length, already, record));
                }
            }
            catch
            {
                stop.Cancel(); // the others finish the run they are on, then stop taking new ones
                throw;
            }
        })).ToArray();
        try
        {
            Task.WaitAll(tasks);
        }
        catch (AggregateException e)
        {
            var first = e.Flatten().InnerExceptions.FirstOrDefault(x => x is not OperationCanceledException) ?? e.Flatten().InnerExceptions[0];
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Capture(first).Throw();
        }
        cancel.ThrowIfCancellationRequested();
        return new SweepOutcome(owned.Length, already, done, file, notes);
    }

    /// <summary>Writes the sweep's description on first use of a folder; refuses a folder that holds another sweep.</summary>
    public static void CheckDefinition(Sweep sweep, string dir)
    {
        Directory.CreateDirectory(dir);
        string path = Path.Combine(dir, ResultsStore.DefinitionFile);
        string description = sweep.Plan.Describe(SweepPlan.Sha256Of(sweep.Plan.Base.DataPath));
        if (File.Exists(path))
        {
            if (File.ReadAllText(path) != description)
                throw new ArgumentException($"{path} describes a different sweep (other data, configs, seeds, folds or settings); " +
                    "use another --out folder, or delete that folder to start over");
            return;
        }
        AtomicFile.WriteAllText(path, description);
    }
}
