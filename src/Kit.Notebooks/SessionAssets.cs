using System.Runtime.CompilerServices;
using Kit.Views;
using Microsoft.DotNet.Interactive;

namespace Kit.Notebooks;

/// <summary>
/// What a notebook session needs once rather than per output: the kit's table/chart styles and the offline
/// plotly.js bundle (several MB). A session is a root kernel; the bundle goes out with the first chart of that
/// session, and every chart script waits for window.Plotly, so later charts draw from it. Formatting outside a
/// kernel (no session to remember) always includes what the fragment needs, so it stays self-contained.
/// </summary>
public static class SessionAssets
{
    sealed class Sent { public bool Styles; public bool Plotly; }

    static readonly ConditionalWeakTable<Kernel, Sent> Sessions = new();

    /// <summary>The rules of the report stylesheet that style fragments; page-level rules would restyle the notebook.</summary>
    /// <remarks>The report's colour variables are scoped to the kit's own elements instead of the page root.</remarks>
    public static readonly string FragmentCss = string.Join("\n",
        ReportWriter.Css.Split('\n').Select(l => l.Trim())
            .Select(l => l.StartsWith(":root", StringComparison.Ordinal) ? "section.kit-section, table.kit-table, figure.kit-chart" + l[":root".Length..] : l)
            .Where(l => l.StartsWith("table.kit-table", StringComparison.Ordinal) ||
                        l.StartsWith("figure.kit-chart", StringComparison.Ordinal) ||
                        l.StartsWith("section.kit-section", StringComparison.Ordinal)));

    public static string StyleTag() => $"<style data-role=\"kit-styles\">{FragmentCss}</style>";

    /// <summary>What must precede a fragment in the current session; marks it as sent.</summary>
    public static string Prelude(bool needsPlotly)
    {
        var root = KernelInvocationContext.Current?.HandlingKernel?.RootKernel;
        if (root is null) return StyleTag() + (needsPlotly ? PlotlyAsset.ScriptTag() : "");
        var sent = Sessions.GetOrCreateValue(root);
        lock (sent)
        {
            string head = "";
            if (!sent.Styles) { head += StyleTag(); sent.Styles = true; }
            if (needsPlotly && !sent.Plotly) { head += PlotlyAsset.ScriptTag(); sent.Plotly = true; }
            return head;
        }
    }

    /// <summary>Sends plotly.js again in this session (e.g. after clearing the output that carried it).</summary>
    public static void ResendPlotly()
    {
        var context = KernelInvocationContext.Current
            ?? throw new InvalidOperationException("ResendPlotly needs a running notebook cell.");
        if (context.HandlingKernel?.RootKernel is { } root)
        {
            var sent = Sessions.GetOrCreateValue(root);
            lock (sent) sent.Plotly = true;
        }
        context.Display(Kernel.HTML(PlotlyAsset.ScriptTag()), "text/html");
    }
}
