using System.Diagnostics;

namespace Kit.Tests.Experiments;

/// <summary>Starts `kit` as a child process: the test's own dotnet host with Kit.Cli.dll from the test output folder.</summary>
internal static class KitCli
{
    public static string RepoRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Kit.sln"))) dir = dir.Parent;
        return dir?.FullName ?? throw new InvalidOperationException("Kit.sln not found above " + AppContext.BaseDirectory);
    }

    public static string DemoHostnames => Path.Combine(RepoRoot(), "data-demo", "hostnames.csv");

    /// <summary>The dotnet host running the tests (so child processes use the same runtime).</summary>
    public static string Host() => Environment.ProcessPath is { } p && Path.GetFileNameWithoutExtension(p) == "dotnet"
        ? p
        : Environment.GetEnvironmentVariable("DOTNET_HOST_PATH") ?? "dotnet";

    /// <summary>Kit.Cli.dll of the test output folder.</summary>
    public static string CliDll => Path.Combine(AppContext.BaseDirectory, "Kit.Cli.dll");

    public static ProcessStartInfo Start(IEnumerable<string> args, IDictionary<string, string>? environment = null)
    {
        var start = new ProcessStartInfo(Host())
        {
            RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false,
            WorkingDirectory = AppContext.BaseDirectory,
        };
        start.ArgumentList.Add(CliDll);
        foreach (var a in args) start.ArgumentList.Add(a);
        foreach (var (k, v) in environment ?? new Dictionary<string, string>()) start.Environment[k] = v;
        return start;
    }

    /// <summary>Runs to the end; returns exit code and both streams (read concurrently so neither pipe fills up).</summary>
    public static (int Code, string Out, string Err) Run(IEnumerable<string> args, IDictionary<string, string>? environment = null,
        int timeoutSeconds = 300)
    {
        using var p = Process.Start(Start(args, environment))!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeoutSeconds * 1000))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"kit {string.Join(' ', args)} did not finish in {timeoutSeconds} s; stderr so far: {stderr}");
        }
        p.WaitForExit();
        return (p.ExitCode, stdout.Result, stderr.Result);
    }

    /// <summary>A tiny sweep on the demo hostnames: small sample, one epoch, small models, one engine thread.</summary>
    public static List<string> TinySweep(string outDir, string grid, int seeds, params string[] more)
    {
        var args = new List<string>
        {
            "compare", DemoHostnames, "--group", "group", "--sample", "300", "--epochs", "1", "--embed", "8", "--hidden", "16",
            "--max-length", "32", "--grid", grid, "--seeds", seeds.ToString(), "--threads", "1", "--out", outDir,
        };
        args.AddRange(more);
        return args;
    }
}
