using System.Reflection;

namespace Kit.Views;

/// <summary>
/// The plotly.js bundle that ships inside the Plotly.NET package, read from its embedded resource so reports
/// and notebooks draw charts with no network. Reading the resource runs no F# code, so it also works in a host
/// whose FSharp.Core is older than the one Plotly.NET was built against.
/// </summary>
public static class PlotlyAsset
{
    static readonly Lazy<(string Version, string Script)> Bundle = new(Load);

    public static string Version => Bundle.Value.Version;
    public static string Script => Bundle.Value.Script;

    /// <summary>A marker placed in every page that embeds the bundle; tests and the CI check look for it.</summary>
    public const string Marker = "kit-plotly-bundle";

    /// <remarks>
    /// The bundle is a UMD module: on a page that has an AMD loader (require.js, as in the classic notebook and
    /// some nbconvert templates) it would register itself with the loader and never set window.Plotly, and the
    /// kit's charts wait for window.Plotly. Running it inside a function whose define, module and exports are
    /// undefined makes it take the global branch on every page.
    /// </remarks>
    public static string ScriptTag() =>
        $"<script data-role=\"{Marker}\" data-version=\"{Version}\">(function(define, module, exports){{\n" +
        Script.Replace("</script", "<\\/script", StringComparison.OrdinalIgnoreCase) +
        "\n}).call(window, undefined, undefined, undefined);</script>";

    static (string, string) Load()
    {
        Assembly asm = typeof(Plotly.NET.GenericChart).Assembly;
        string name = asm.GetManifestResourceNames()
            .Where(n => n.StartsWith("Plotly.NET.plotly-", StringComparison.Ordinal) && n.EndsWith(".min.js", StringComparison.Ordinal))
            .OrderBy(n => n, StringComparer.Ordinal).LastOrDefault()
            ?? throw new InvalidOperationException("Plotly.NET does not carry a plotly.js bundle; cannot write an offline chart.");
        using var stream = asm.GetManifestResourceStream(name)!;
        using var reader = new StreamReader(stream);
        string version = name["Plotly.NET.plotly-".Length..^".min.js".Length];
        return (version, reader.ReadToEnd());
    }
}
