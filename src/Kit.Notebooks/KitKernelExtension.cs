using Kit.Native;
using Kit.Views;
using Microsoft.DotNet.Interactive;

namespace Kit.Notebooks;

/// <summary>
/// Loaded by the kernel from the package's interactive-extensions/dotnet folder after
/// <c>#r "nuget: Kit.Notebooks, ..."</c>. It prepares the engine before any cell can touch TorchSharp, teaches
/// the formatter the kit's views, and says in one line what it did.
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
        string version = typeof(KitKernelExtension).Assembly.GetName().Version?.ToString(3) ?? "?";
        KernelInvocationContext.Current?.Display(Kernel.HTML(
            $"<div class=\"kit-loaded\" style=\"font-size:12px;color:{Theme.Muted}\">Kit {Html.Escape(version)} loaded · " +
            $"{Html.Escape(engine)} · views for {ViewRegistry.Types.Count} record types · charts offline (plotly.js {Html.Escape(PlotlyAsset.Version)})</div>"), "text/html");
        return Task.CompletedTask;
    }
}
