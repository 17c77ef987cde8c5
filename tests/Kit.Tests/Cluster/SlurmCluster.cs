using System.ComponentModel;
using System.Diagnostics;
using System.Text;

namespace Kit.Tests.Cluster;

/// <summary>
/// Talks to a real Slurm cluster through its own commands (sinfo, sbatch, squeue, scancel, scontrol): submits job
/// scripts, follows jobs until they end — always with a time bound — and gathers what a failure message needs.
/// </summary>
internal static class SlurmCluster
{
    /// <summary>Job states after which Slurm does nothing more with a job (squeue's long names).</summary>
    static readonly HashSet<string> s_ended =
    [
        "COMPLETED", "FAILED", "CANCELLED", "TIMEOUT", "NODE_FAIL", "OUT_OF_MEMORY", "PREEMPTED", "BOOT_FAIL", "DEADLINE",
    ];

    /// <summary>Why jobs cannot be submitted here, or null when a controller answers and a node can take work.</summary>
    public static string? Problem()
    {
        try
        {
            var (code, stdout, stderr) = Run("sinfo", ["-h", "-N", "-o", "%t"], timeoutSeconds: 20);
            if (code != 0) return $"`sinfo` failed ({code}): {stderr.Trim()}";
            var states = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            if (states.Length == 0) return "`sinfo` lists no node.";
            if (!states.Any(s => s.TrimEnd('*', '~', '#', '!', '%', '$', '@', '^', '-') is "idle" or "mix" or "alloc"))
                return $"no Slurm node can take jobs (node states: {string.Join(", ", states)}).";
            return null;
        }
        catch (Win32Exception e)
        {
            return $"the Slurm client commands are not installed ({e.Message}).";
        }
        catch (TimeoutException)
        {
            return "`sinfo` did not answer within 20 s (is slurmctld running?).";
        }
    }

    /// <summary>Submits a job script from <paramref name="workDir"/> (the job's working folder); returns the job id.</summary>
    public static string Submit(string workDir, IReadOnlyDictionary<string, string> environment, params string[] sbatchArgs)
    {
        var (code, stdout, stderr) = Run("sbatch", ["--parsable", .. sbatchArgs], workDir, environment);
        if (code != 0) throw new Xunit.Sdk.XunitException($"sbatch {string.Join(' ', sbatchArgs)} failed ({code}): {stderr}");
        // --parsable prints "jobid" or "jobid;cluster".
        return stdout.Trim().Split(';')[0];
    }

    public static void Cancel(string jobId)
    {
        var (code, _, stderr) = Run("scancel", [jobId]);
        if (code != 0) throw new Xunit.Sdk.XunitException($"scancel {jobId} failed ({code}): {stderr}");
    }

    /// <summary>
    /// Each job (or array task) of <paramref name="jobId"/> with its state and reason, finished ones included
    /// (Slurm keeps them for MinJobAge, 300 s by default). A not yet split part of an array shows as "ID_[a-b]".
    /// </summary>
    public static IReadOnlyList<(string Id, string State, string Reason)> Jobs(string jobId)
    {
        var (code, stdout, stderr) = Run("squeue", ["-h", "-t", "all", "-j", jobId, "-o", "%i|%T|%r"]);
        if (code != 0) throw new Xunit.Sdk.XunitException($"squeue -j {jobId} failed ({code}): {stderr}");
        return stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)
            .Select(line => line.Split('|'))
            .Select(f => (f[0], f[1], f.Length > 2 ? f[2] : ""))
            .ToList();
    }

    /// <summary>
    /// Polls until every job of <paramref name="jobId"/> has ended; fails with <paramref name="diagnostics"/> when
    /// that takes longer than <paramref name="timeout"/> or when a dependency can never be met.
    /// </summary>
    public static IReadOnlyList<(string Id, string State, string Reason)> WaitUntilEnded(string jobId, TimeSpan timeout, Func<string> diagnostics)
    {
        var clock = Stopwatch.StartNew();
        while (true)
        {
            var jobs = Jobs(jobId);
            if (jobs.Count > 0 && jobs.All(j => s_ended.Contains(j.State))) return jobs;
            if (jobs.Any(j => j.Reason == "DependencyNeverSatisfied"))
                throw new Xunit.Sdk.XunitException($"job {jobId} waits on a dependency that can never be met.\n{diagnostics()}");
            if (clock.Elapsed > timeout)
                throw new Xunit.Sdk.XunitException(
                    $"job {jobId} had not ended after {timeout.TotalSeconds:0} s: {Describe(jobs)}\n{diagnostics()}");
            Thread.Sleep(500);
        }
    }

    public static string Describe(IEnumerable<(string Id, string State, string Reason)> jobs) =>
        string.Join(", ", jobs.Select(j => $"{j.Id} {j.State}" + (j.Reason is "" or "None" ? "" : $" ({j.Reason})")));

    /// <summary>`scontrol show job` for each job and every job output file under <paramref name="logs"/>.</summary>
    public static string Report(string logs, IEnumerable<string> jobIds)
    {
        var text = new StringBuilder();
        foreach (var id in jobIds)
        {
            try { text.AppendLine($"--- scontrol show job {id}").AppendLine(Run("scontrol", ["show", "job", id]).Out); }
            catch (Exception e) when (e is Win32Exception or TimeoutException) { text.AppendLine($"(scontrol: {e.Message})"); }
        }
        if (Directory.Exists(logs))
            foreach (var file in Directory.GetFiles(logs).Order(StringComparer.Ordinal))
                text.AppendLine($"--- {Path.GetFileName(file)}").AppendLine(File.ReadAllText(file));
        return text.ToString();
    }

    /// <summary>Runs a command to the end (both streams read concurrently); throws TimeoutException after the bound.</summary>
    public static (int Code, string Out, string Err) Run(string file, IEnumerable<string> args, string? workDir = null,
        IReadOnlyDictionary<string, string>? environment = null, int timeoutSeconds = 60)
    {
        var start = new ProcessStartInfo(file)
        {
            RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false,
            WorkingDirectory = workDir ?? Environment.CurrentDirectory,
        };
        foreach (var a in args) start.ArgumentList.Add(a);
        foreach (var (k, v) in environment ?? new Dictionary<string, string>()) start.Environment[k] = v;
        using var p = Process.Start(start)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeoutSeconds * 1000))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"{file} {string.Join(' ', args)} did not finish in {timeoutSeconds} s");
        }
        p.WaitForExit();
        return (p.ExitCode, stdout.Result, stderr.Result);
    }
}
