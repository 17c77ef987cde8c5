using System.Diagnostics;
using System.Text;

namespace Kit.Notebooks.Tests;

/// <summary>
/// Jupyter as a user has it: Debian's nbconvert/nbclient driving the .NET kernel that
/// <c>dotnet interactive jupyter install</c> registered. Debian's packages install no <c>jupyter nbconvert</c>
/// command, so nbconvert runs as a module of the Python that has it (KIT_JUPYTER_PYTHON, else /usr/bin/python3,
/// else python3 on PATH: a pyenv or venv python3 earlier on PATH usually lacks the Debian modules).
/// </summary>
internal static class JupyterClient
{
    public const string KernelName = ".net-csharp";
    public const string PythonVariable = "KIT_JUPYTER_PYTHON";

    const string Probe = """
        import sys
        try:
            import nbconvert, nbclient, jupyter_client
        except ImportError as e:
            print("missing-module", e.name); sys.exit(3)
        from jupyter_client.kernelspec import KernelSpecManager, NoSuchKernel
        try:
            spec = KernelSpecManager().get_kernel_spec(".net-csharp")
        except NoSuchKernel:
            print("no-kernel"); sys.exit(4)
        print("ok nbconvert", nbconvert.__version__, "nbclient", nbclient.__version__, "kernel", spec.resource_dir)
        """;

    sealed record Found(string? Python, string? Problem, string Description);

    static readonly Lazy<Found> Located = new(Locate);

    public static string? Problem() => Located.Value.Problem;

    public static string Python => Located.Value.Python ?? throw new InvalidOperationException(Located.Value.Problem);

    /// <summary>Versions and kernel folder, for the test log.</summary>
    public static string Description => Located.Value.Description;

    /// <summary>Where `dotnet tool install -g` puts commands; the kernel spec runs `dotnet interactive`, which looks there via PATH.</summary>
    public static string GlobalToolsFolder =>
        Path.Combine(Environment.GetEnvironmentVariable("DOTNET_CLI_HOME") is { Length: > 0 } home ? home
            : Environment.GetFolderPath(Environment.SpecialFolder.UserProfile), ".dotnet", "tools");

    static Found Locate()
    {
        string? tool = FindOnPath("dotnet-interactive");
        if (tool is null) return new Found(null, $"the dotnet-interactive tool is neither on PATH nor in {GlobalToolsFolder}.", "");
        var candidates = new[] { Environment.GetEnvironmentVariable(PythonVariable), "/usr/bin/python3", "python3" }
            .Where(c => !string.IsNullOrWhiteSpace(c)).Distinct().ToArray();
        var tried = new List<string>();
        foreach (var python in candidates)
        {
            Result probe;
            try { probe = Run(python!, Directory.GetCurrentDirectory(), TimeSpan.FromSeconds(60), "-c", Probe); }
            catch (System.ComponentModel.Win32Exception) { tried.Add($"{python}: not found"); continue; }
            if (probe.ExitCode == 0) return new Found(python, null, $"{python}: {probe.Output.Trim().Split('\n').Last()}; tool {tool}");
            if (probe.Output.Contains("no-kernel", StringComparison.Ordinal))
                return new Found(null, $"{python} has nbconvert but no '{KernelName}' kernel spec (run `dotnet interactive jupyter install`).", "");
            tried.Add($"{python}: {probe.Output.Trim().Split('\n').FirstOrDefault()}");
        }
        return new Found(null, $"no Python with nbconvert, nbclient and jupyter_client ({string.Join("; ", tried)}).", "");
    }

    static string? FindOnPath(string command)
    {
        var dirs = (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator).Append(GlobalToolsFolder);
        return dirs.Select(d => Path.Combine(d, command)).FirstOrDefault(File.Exists);
    }

    /// <summary>
    /// Executes <paramref name="notebook"/> in the .NET kernel, writing <paramref name="output"/> beside it. The
    /// kernel starts in the notebook's folder, so a NuGet.Config there is the one its package restore reads.
    /// </summary>
    public static Result Execute(string notebook, string output, TimeSpan cellTimeout, TimeSpan totalTimeout) =>
        Run(Python, Path.GetDirectoryName(notebook)!, totalTimeout, "-m", "nbconvert", "--to", "notebook", "--execute", Path.GetFileName(notebook),
            "--output", Path.GetFileName(output), $"--ExecutePreprocessor.kernel_name={KernelName}",
            $"--ExecutePreprocessor.timeout={(int)cellTimeout.TotalSeconds}", "--ExecutePreprocessor.startup_timeout=180");

    /// <summary>An executed notebook as Jupyter's own HTML page (nbconvert's default template).</summary>
    public static Result ToHtml(string notebook, string output) =>
        Run(Python, Path.GetDirectoryName(notebook)!, TimeSpan.FromMinutes(2), "-m", "nbconvert", "--to", "html", Path.GetFileName(notebook),
            "--output", Path.GetFileName(output), "--output-dir", Path.GetDirectoryName(output)!);

    public sealed record Result(int ExitCode, string Output, TimeSpan Elapsed)
    {
        /// <summary>The end of the log, where nbconvert names the failing cell.</summary>
        public string Tail(int chars = 4000) => Output.Length <= chars ? Output : "…" + Output[^chars..];
    }

    static Result Run(string program, string workingDirectory, TimeSpan timeout, params string[] args)
    {
        var start = new ProcessStartInfo(program)
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var a in args) start.ArgumentList.Add(a);
        start.Environment["PATH"] = (Environment.GetEnvironmentVariable("PATH") ?? "") + Path.PathSeparator + GlobalToolsFolder;
        start.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        start.Environment["DOTNET_INTERACTIVE_CLI_TELEMETRY_OPTOUT"] = "1";
        start.Environment["DOTNET_NOLOGO"] = "1";
        // Debuggers warn about frozen modules on some Pythons; the noise would bury nbconvert's own messages.
        start.Environment["PYDEVD_DISABLE_FILE_VALIDATION"] = "1";
        var clock = Stopwatch.StartNew();
        using var process = Process.Start(start) ?? throw new InvalidOperationException($"could not start {program}");
        var log = new StringBuilder();
        process.OutputDataReceived += (_, e) => { if (e.Data is not null) lock (log) log.AppendLine(e.Data); };
        process.ErrorDataReceived += (_, e) => { if (e.Data is not null) lock (log) log.AppendLine(e.Data); };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        if (!process.WaitForExit(timeout))
        {
            process.Kill(entireProcessTree: true);
            process.WaitForExit();
            lock (log) return new Result(-1, log + $"\n(stopped after {timeout.TotalSeconds:F0} s)", clock.Elapsed);
        }
        process.WaitForExit();
        lock (log) return new Result(process.ExitCode, log.ToString(), clock.Elapsed);
    }
}
