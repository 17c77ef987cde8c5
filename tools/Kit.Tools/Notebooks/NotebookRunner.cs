using System.Diagnostics;
using Microsoft.DotNet.Interactive;
using Microsoft.DotNet.Interactive.Commands;
using Microsoft.DotNet.Interactive.CSharp;
using Microsoft.DotNet.Interactive.Documents;
using Microsoft.DotNet.Interactive.Events;
using Microsoft.DotNet.Interactive.Formatting;
using Microsoft.DotNet.Interactive.PackageManagement;

namespace Kit.Tools.Notebooks;

/// <summary>
/// Runs a notebook without a front end: code cells in order in a fresh embedded C# kernel, stopping at the first
/// failing cell. Cells run with the notebook's own folder as the working directory, as Jupyter starts its kernels
/// there, so a relative path (../data-demo/...) means the same headless and in a browser.
/// </summary>
public sealed class NotebookRunner
{
    // The working directory is per process; runs take turns so one notebook's relative paths never see another's folder.
    static readonly SemaphoreSlim OneAtATime = new(1, 1);

    /// <summary>Longest a single cell may take before the run stops it and reports it as failed.</summary>
    public TimeSpan CellTimeout { get; init; } = TimeSpan.FromMinutes(10);

    /// <summary>
    /// Package sources (folders or URLs) the kernel restores from before the first cell, as if the notebook began
    /// with <c>#i "nuget: ..."</c>. Notebooks stay free of machine-specific paths: in Jupyter the same folder is a
    /// NuGet source registered once (docs/notebooks.md); headless it is given here.
    /// </summary>
    public IReadOnlyList<string> PackageSources { get; init; } = Array.Empty<string>();

    /// <summary>Called after each code cell (progress lines for the CLI).</summary>
    public Action<CellOutcome>? OnCell { get; init; }

    public async Task<NotebookRunResult> RunAsync(string path, CancellationToken cancellationToken = default)
    {
        string full = Path.GetFullPath(path);
        var document = NotebookFile.Load(full);
        await OneAtATime.WaitAsync(cancellationToken);
        string previousDirectory = Environment.CurrentDirectory;
        try
        {
            Environment.CurrentDirectory = Path.GetDirectoryName(full)!;
            using var kernel = CreateKernel();
            return await RunCellsAsync(full, document, kernel, cancellationToken);
        }
        finally
        {
            Environment.CurrentDirectory = previousDirectory;
            OneAtATime.Release();
        }
    }

    /// <summary>A C# kernel as the notebook tool sets it up for a notebook: helpers, #r/#i nuget, package extensions.</summary>
    public static CompositeKernel CreateKernel()
    {
        // As in the notebook front ends: every value also gets a text/plain form, for logs and for saved notebooks
        // read where HTML is not rendered.
        Formatter.SetPreferredMimeTypesFor(typeof(object), HtmlFormatter.MimeType, PlainTextFormatter.MimeType);
        var csharp = new CSharpKernel()
            .UseNugetDirective((k, references) =>
            {
                k.AddAssemblyReferences(references.SelectMany(r => r.AssemblyPaths));
                return Task.CompletedTask;
            })
            .UseKernelHelpers()
            .UseValueSharing();
        var composite = new CompositeKernel { csharp };
        composite.DefaultKernelName = csharp.Name;
        PackageExtensionLoader.Attach(composite);
        return composite;
    }

    async Task<NotebookRunResult> RunCellsAsync(string path, InteractiveDocument document, CompositeKernel kernel, CancellationToken cancellationToken)
    {
        var total = Stopwatch.StartNew();
        var outcomes = new List<CellOutcome>();
        bool stopped = false;
        int executionCount = 0;
        if (PackageSources.Count > 0)
        {
            string setup = string.Join("\n", PackageSources.Select(p => $"#i \"nuget: {SourceText(p)}\""));
            var outcome = await RunCellAsync(kernel, 0, setup, cancellationToken);
            if (outcome.Status == CellStatus.Failed)
            {
                outcomes.Add(outcome with { KernelName = "setup" });
                stopped = true;
            }
        }
        for (int i = 0; i < document.Elements.Count; i++)
        {
            var cell = document.Elements[i];
            int number = i + 1;
            string kernelName = string.IsNullOrEmpty(cell.KernelName) ? NotebookFile.CSharp : cell.KernelName;
            if (kernelName == NotebookFile.Markdown)
            {
                outcomes.Add(new CellOutcome(number, kernelName, cell.Contents, CellStatus.Text, Array.Empty<CellOutput>(), TimeSpan.Zero));
                continue;
            }
            if (stopped || string.IsNullOrWhiteSpace(cell.Contents))
            {
                outcomes.Add(new CellOutcome(number, kernelName, cell.Contents, CellStatus.NotRun, Array.Empty<CellOutput>(), TimeSpan.Zero));
                SetOutputs(cell, Array.Empty<CellOutput>(), 0);
                continue;
            }

            string? refused = kernelName != NotebookFile.CSharp
                ? $"the cell's language is '{kernelName}'; the headless runner has only a C# kernel"
                : RelativeSource(cell.Contents);
            var outcome = refused is null
                ? await RunCellAsync(kernel, number, cell.Contents, cancellationToken)
                : new CellOutcome(number, kernelName, cell.Contents, CellStatus.Failed, Array.Empty<CellOutput>(), TimeSpan.Zero, refused);
            outcomes.Add(outcome);
            SetOutputs(cell, outcome.Outputs, ++executionCount);
            OnCell?.Invoke(outcome);
            if (outcome.Status == CellStatus.Failed) stopped = true;
        }
        return new NotebookRunResult(path, outcomes, document, total.Elapsed);
    }

    static string SourceText(string source) =>
        source.Contains("://", StringComparison.Ordinal) ? source : Path.GetFullPath(source);

    /// <summary>
    /// The kernel rejects a relative package folder with only "Invalid URI"; say what is wrong and what works,
    /// rather than rewrite the line, which would pass here and still fail in Jupyter.
    /// </summary>
    internal static string? RelativeSource(string code)
    {
        foreach (var line in code.Split('\n'))
        {
            var m = System.Text.RegularExpressions.Regex.Match(line, "^\\s*#i\\s+\"nuget:\\s*([^\"]+)\"");
            if (!m.Success) continue;
            string source = m.Groups[1].Value.Trim();
            if (!source.Contains("://", StringComparison.Ordinal) && !Path.IsPathRooted(source))
                return $"#i \"nuget: {source}\" names a relative folder, which the notebook kernel cannot use (it accepts absolute paths and URLs only). " +
                       "Register the folder once as a NuGet source or pass it to the runner (kit notebook run --feed); see docs/notebooks.md.";
        }
        return null;
    }

    async Task<CellOutcome> RunCellAsync(CompositeKernel kernel, int number, string code, CancellationToken cancellationToken)
    {
        var watch = Stopwatch.StartNew();
        using var timeout = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        timeout.CancelAfter(CellTimeout);
        KernelCommandResult result;
        try
        {
            result = await kernel.SendAsync(new SubmitCode(code, NotebookFile.CSharp), timeout.Token);
        }
        catch (OperationCanceledException) when (!cancellationToken.IsCancellationRequested)
        {
            return new CellOutcome(number, NotebookFile.CSharp, code, CellStatus.Failed, Array.Empty<CellOutput>(), watch.Elapsed,
                $"did not finish within {CellTimeout.TotalSeconds:F0} s");
        }

        var outputs = new List<CellOutput>();
        string? error = null;
        foreach (var e in result.Events)
        {
            switch (e)
            {
                case DisplayedValueUpdated updated:
                    int at = outputs.FindIndex(o => o.ValueId == updated.ValueId);
                    var replacement = new CellOutput(CellOutput.Display, Data(updated), updated.ValueId);
                    if (at >= 0) outputs[at] = replacement; else outputs.Add(replacement);
                    break;
                case DisplayedValueProduced shown:
                    outputs.Add(new CellOutput(CellOutput.Display, Data(shown), shown.ValueId));
                    break;
                case ReturnValueProduced returned:
                    outputs.Add(new CellOutput(CellOutput.Result, Data(returned), returned.ValueId));
                    break;
                case StandardOutputValueProduced stdout:
                    outputs.Add(new CellOutput(CellOutput.StandardOutput, Data(stdout)));
                    break;
                case StandardErrorValueProduced stderr:
                    outputs.Add(new CellOutput(CellOutput.StandardError, Data(stderr)));
                    break;
                case ErrorProduced produced:
                    outputs.Add(new CellOutput(CellOutput.Error, new Dictionary<string, string> { ["text/plain"] = produced.Message }));
                    break;
                case CommandFailed failed when failed.Command is SubmitCode:
                    error ??= failed.Message;
                    break;
            }
        }
        if (error is not null)
            outputs.Add(new CellOutput(CellOutput.Error, new Dictionary<string, string> { ["text/plain"] = error }));
        return new CellOutcome(number, NotebookFile.CSharp, code, error is null ? CellStatus.Passed : CellStatus.Failed,
            outputs, watch.Elapsed, error);
    }

    static Dictionary<string, string> Data(DisplayEvent e) =>
        e.FormattedValues.Where(v => !v.SuppressDisplay).GroupBy(v => v.MimeType).ToDictionary(g => g.Key, g => g.Last().Value);

    /// <summary>The document read from disk becomes the executed one: its metadata stays exactly as it was read.</summary>
    static void SetOutputs(InteractiveDocumentElement cell, IReadOnlyList<CellOutput> outputs, int executionOrder)
    {
        cell.Outputs.Clear();
        cell.Outputs.AddRange(outputs.Select(ToElement));
        cell.ExecutionOrder = executionOrder;
    }

    static InteractiveDocumentOutputElement ToElement(CellOutput o) => o.Kind switch
    {
        CellOutput.Error => new ErrorElement(o.Text ?? "", "Error", Array.Empty<string>()),
        CellOutput.StandardOutput or CellOutput.StandardError => new TextElement(o.Text ?? "", o.Kind),
        CellOutput.Result => Fill(new ReturnValueElement(), o),
        _ => new DisplayElement(o.Data.ToDictionary(kv => kv.Key, kv => (object)kv.Value)),
    };

    static ReturnValueElement Fill(ReturnValueElement element, CellOutput o)
    {
        foreach (var (k, v) in o.Data) element.Data[k] = v;
        return element;
    }
}
