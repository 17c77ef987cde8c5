using System.Diagnostics;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace Kit.Notebooks.Tests;

/// <summary>
/// The real notebook kernel (the dotnet-interactive tool pinned in .config/dotnet-tools.json beside this file),
/// driven over its stdio protocol: one JSON command per line in, one JSON event per line out. This is the host a
/// Jupyter or VS Code notebook talks to, so what passes here passes there, FSharp.Core and assembly loading included.
/// </summary>
internal sealed class StdioKernel : IDisposable
{
    public sealed record Output(string EventType, string MimeType, string Value);
    public sealed record Submission(bool Succeeded, string? Error, IReadOnlyList<Output> Outputs);

    readonly Process _process;
    int _token;

    StdioKernel(Process process) => _process = process;

    public static StdioKernel Start()
    {
        string toolDir = Path.Combine(LocalFeed.FindRepoRoot(AppContext.BaseDirectory), "tests", "Kit.Notebooks.Tests");
        Run(toolDir, "tool", "restore");
        var start = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = toolDir,
            RedirectStandardInput = true,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var a in new[] { "tool", "run", "dotnet-interactive", "stdio", "--default-kernel", "csharp" }) start.ArgumentList.Add(a);
        start.Environment["DOTNET_INTERACTIVE_CLI_TELEMETRY_OPTOUT"] = "1";
        start.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        var process = Process.Start(start) ?? throw new InvalidOperationException("could not start dotnet-interactive");
        process.ErrorDataReceived += (_, _) => { };
        process.BeginErrorReadLine();
        return new StdioKernel(process);
    }

    public async Task<Submission> SubmitAsync(string code, TimeSpan timeout)
    {
        string token = $"kit-{++_token}";
        var envelope = new JsonObject
        {
            ["token"] = token,
            ["commandType"] = "SubmitCode",
            ["command"] = new JsonObject { ["code"] = code, ["targetKernelName"] = "csharp" },
        };
        await _process.StandardInput.WriteLineAsync(envelope.ToJsonString());
        await _process.StandardInput.FlushAsync();

        var outputs = new List<Output>();
        using var cts = new CancellationTokenSource(timeout);
        while (true)
        {
            string? line = await _process.StandardOutput.ReadLineAsync(cts.Token);
            if (line is null) return new Submission(false, "the kernel exited", outputs);
            if (!line.TrimStart().StartsWith('{')) continue;
            JsonNode? node;
            try { node = JsonNode.Parse(line); } catch (JsonException) { continue; }
            string? type = node?["eventType"]?.GetValue<string>();
            var ev = node?["event"];
            string? commandToken = node?["command"]?["token"]?.GetValue<string>();
            if (type is "DisplayedValueProduced" or "DisplayedValueUpdated" or "ReturnValueProduced" or "StandardOutputValueProduced" or "ErrorProduced")
            {
                foreach (var fv in ev?["formattedValues"]?.AsArray() ?? new JsonArray())
                    outputs.Add(new Output(type, fv!["mimeType"]!.GetValue<string>(), fv["value"]!.GetValue<string>()));
            }
            else if (type == "CommandFailed" && commandToken == token)
                return new Submission(false, ev?["message"]?.GetValue<string>(), outputs);
            else if (type == "CommandSucceeded" && commandToken == token)
                return new Submission(true, null, outputs);
        }
    }

    static void Run(string dir, params string[] args)
    {
        var start = new ProcessStartInfo("dotnet") { WorkingDirectory = dir, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in args) start.ArgumentList.Add(a);
        using var p = Process.Start(start)!;
        string output = p.StandardOutput.ReadToEnd() + p.StandardError.ReadToEnd();
        p.WaitForExit();
        if (p.ExitCode != 0) throw new InvalidOperationException($"dotnet {string.Join(' ', args)} failed in {dir}:\n{output}");
    }

    public void Dispose()
    {
        try { _process.StandardInput.Close(); } catch (IOException) { }
        if (!_process.WaitForExit(5000)) _process.Kill(entireProcessTree: true);
        _process.Dispose();
    }
}
