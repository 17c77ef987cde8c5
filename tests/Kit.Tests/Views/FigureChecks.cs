using System.Text.Json.Nodes;
using Kit.Views;

namespace Kit.Tests.Views;

/// <summary>Reads a chart's figure JSON back and checks the house rules every chart must keep.</summary>
internal static class FigureChecks
{
    public static (JsonArray Data, JsonObject Layout) Parse(ChartView chart)
    {
        var figure = JsonNode.Parse(chart.FigureJson())!.AsObject();
        return (figure["data"]!.AsArray(), figure["layout"]!.AsObject());
    }

    /// <summary>
    /// Every axis a trace draws on exists in the layout and has a title; a chart with no cartesian axes (none
    /// here) would fail, because every chart of the kit is meant to have them. Colour bars must be titled too.
    /// </summary>
    public static void HasTitledAxes(ChartView chart)
    {
        var (data, layout) = Parse(chart);
        Assert.NotEmpty(data);
        Assert.False(string.IsNullOrWhiteSpace(layout["title"]?["text"]?.GetValue<string>()), $"{chart.Title}: no chart title");
        var used = new HashSet<string>();
        foreach (var trace in data)
        {
            used.Add(AxisKey("xaxis", trace!["xaxis"]?.GetValue<string>() ?? "x"));
            used.Add(AxisKey("yaxis", trace["yaxis"]?.GetValue<string>() ?? "y"));
            if (trace["colorbar"] is JsonObject bar)
                Assert.False(string.IsNullOrWhiteSpace(bar["title"]?["text"]?.GetValue<string>()), $"{chart.Title}: colour bar without a title");
        }
        foreach (var key in layout.Where(p => p.Key.StartsWith("xaxis", StringComparison.Ordinal) || p.Key.StartsWith("yaxis", StringComparison.Ordinal)).Select(p => p.Key))
            used.Add(key);
        foreach (var axis in used)
        {
            Assert.True(layout[axis] is JsonObject, $"{chart.Title}: a trace draws on {axis}, which the layout does not define");
            string? text = layout[axis]!["title"]?["text"]?.GetValue<string>();
            Assert.False(string.IsNullOrWhiteSpace(text), $"{chart.Title}: {axis} has no title");
        }
    }

    static string AxisKey(string kind, string reference) => reference.Length == 1 ? kind : kind + reference[1..];

    public static JsonObject Trace(ChartView chart, string name) =>
        Parse(chart).Data.Select(t => t!.AsObject()).Single(t => t["name"]?.GetValue<string>() == name);

    public static double?[] Numbers(JsonNode? array) => array!.AsArray().Select(v => v is null ? (double?)null : v.GetValue<double>()).ToArray();

    public static string Title(ChartView chart) => Parse(chart).Layout["title"]!["text"]!.GetValue<string>();
}
