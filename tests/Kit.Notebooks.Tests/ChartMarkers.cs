using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using Kit.Views;

namespace Kit.Notebooks.Tests;

/// <summary>
/// Counts what cell outputs carry, from the HTML the kernel sent: chart elements (each ChartView writes one
/// element with data-kit-chart="1") and copies of the plotly.js bundle.
/// </summary>
internal static partial class ChartMarkers
{
    public static int Charts(string? html) => html is null ? 0 : ChartElement().Matches(html).Count;

    public static int Bundles(string? html) => html is null ? 0 : Regex.Matches(html, $"data-role=\"{PlotlyAsset.Marker}\"").Count;

    /// <summary>The text/html of every output of every code cell of a saved notebook (nbformat 4), cell by cell.</summary>
    public static IReadOnlyList<string[]> HtmlByCodeCell(JsonNode notebook) =>
        notebook["cells"]!.AsArray()
            .Where(c => c!["cell_type"]!.GetValue<string>() == "code")
            .Select(c => c!["outputs"]!.AsArray().Select(o => Text(o!["data"]?["text/html"])).Where(h => h is not null).Select(h => h!).ToArray())
            .ToArray();

    /// <summary>nbformat stores multi-line strings either whole or as a list of lines.</summary>
    public static string? Text(JsonNode? node) => node switch
    {
        null => null,
        JsonArray lines => string.Concat(lines.Select(l => l!.GetValue<string>())),
        _ => node.GetValue<string>(),
    };

    [GeneratedRegex("data-kit-chart=\"1\"")] private static partial Regex ChartElement();
}
