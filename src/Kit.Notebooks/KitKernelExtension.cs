using Kit.Native;
using Kit.Views;
using Microsoft.DotNet.Interactive;
using Microsoft.DotNet.Interactive.Commands;

namespace Kit.Notebooks;

/// <summary>
/// Loaded by the kernel from the package's interactive-extensions/dotnet folder after
/// <c>#r "nuget: Kit.Notebooks, ..."</c>. It prepares the engine before any cell can touch TorchSharp, teaches
/// the formatter the kit's views, imports the kit's namespaces into the C# kernel (so a notebook needs no
/// <c>using</c> line to start), and says in one line what it did.
/// </summary>
public sealed class KitKernelExtension : IKernelExtension
{
    public Task OnLoadAsync(Kernel kernel)
    {
        string engine;
        try
        {
            engine = Engine.EnsureLoaded().ToString();
        }
        catch (EngineLoadException e)
        {
            // Views and data work without the engine; say clearly why training will not.
            engine = "engine not loaded: " + e.Message;
        }
        ViewFormatters.RegisterAll();
        // Runs before the next cell, in the C# kernel the package was loaded into.
        var csharp = kernel.Name == "csharp" ? kernel : kernel.FindKernelByName("csharp");
        csharp?.DeferCommand(new SubmitCode(Imports));
        string version = typeof(KitKernelExtension).Assembly.GetName().Version?.ToString(3) ?? "?";
        KernelInvocationContext.Current?.Display(Kernel.HTML(
            $"<div class=\"kit-loaded\" style=\"font-size:12px;color:{Theme.Muted}\">Kit {Html.Escape(version)} loaded · " +
            $"{Html.Escape(engine)} · views for {ViewRegistry.Types.Count} record types · charts offline (plotly.js {Html.Escape(PlotlyAsset.Version)})</div>"), "text/html");
        return Task.CompletedTask;
    }

    /// <summary>The namespaces a notebook gets on load: the kit's public API, layer by layer, and System.IO for paths.</summary>
    public static readonly IReadOnlyList<string> Namespaces =
        ["System.IO", "Kit.Data", "Kit.Models", "Kit.Training", "Kit.Diagnostics", "Kit.Experiments", "Kit.Views", "Kit.Notebooks"];

    internal static string Imports => string.Concat(Namespaces.Select(n => $"using {n};\n"));
}
