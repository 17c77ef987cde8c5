using System.Diagnostics;

namespace Kit.Experiments;

/// <summary>
/// A worker process that runs one run per request (see <see cref="SweepWorker"/>): the run's id goes down its
/// standard input, the finished record comes back on its standard output as "result {json}". Lines without
/// that prefix are ignored, so stray output from native code cannot corrupt the exchange. The worker's
/// standard error is left on the console so its progress shows.
/// </summary>
internal sealed class ProcessWorker : IRunExecutor, IDisposable
{
    public const string ResultPrefix = "result ", ErrorPrefix = "error ";
    readonly Process _process;

    public ProcessWorker(ProcessStartInfo start)
    {
        start.RedirectStandardInput = true;
        start.RedirectStandardOutput = true;
        start.UseShellExecute = false;
        _process = Process.Start(start) ?? throw new InvalidOperationException($"could not start worker {start.FileName}");
    }

    public int ProcessId => _process.Id;

    public RunRecord Execute(RunKey key, CancellationToken cancel)
    {
        cancel.ThrowIfCancellationRequested();
        _process.StandardInput.WriteLine(key.Id);
        _process.StandardInput.Flush();
        while (true)
        {
            string? line = _process.StandardOutput.ReadLine();
            if (line is null)
            {
                _process.WaitForExit(5000);
                string code = _process.HasExited ? $"exit code {_process.ExitCode}" : "still running";
                throw new InvalidOperationException($"worker process {_process.Id} stopped ({code}) before finishing run {key.Id}");
            }
            if (line.StartsWith(ResultPrefix, StringComparison.Ordinal)) return RunRecord.FromJson(line[ResultPrefix.Length..]);
            if (line.StartsWith(ErrorPrefix, StringComparison.Ordinal))
                throw new InvalidOperationException($"run {key.Id} failed in worker {_process.Id}: {line[ErrorPrefix.Length..]}");
        }
    }

    public void Dispose()
    {
        try
        {
            _process.StandardInput.Close(); // end of input: the worker leaves its loop
            if (!_process.WaitForExit(10_000)) _process.Kill(entireProcessTree: true);
        }
        catch (InvalidOperationException) { }
        catch (IOException) { }
        _process.Dispose();
    }
}
