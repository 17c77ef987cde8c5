using System.Text.Json.Nodes;

namespace Kit.Views;

/// <summary>
/// Small builders for plotly.js figure JSON, so every view writes traces the same way: missing numbers become
/// null (a gap, never a fake zero) and any text from the data is entity-encoded, because plotly reads a few
/// HTML-like tags (&lt;b&gt;, &lt;br&gt;, &lt;a&gt;) in labels and hover text and would otherwise format a
/// hostname instead of showing it.
/// </summary>
public static class Figure
{
    public static JsonArray Numbers(IEnumerable<double> values) =>
        new(values.Select(v => double.IsFinite(v) ? JsonValue.Create(v) : null).ToArray<JsonNode?>());

    public static JsonArray Numbers(IEnumerable<int> values) => new(values.Select(v => (JsonNode?)JsonValue.Create(v)).ToArray());

    /// <summary>Text shown by plotly (tick labels, hover, annotations), entity-encoded.</summary>
    public static JsonArray Texts(IEnumerable<string?> values) => new(values.Select(v => (JsonNode?)JsonValue.Create(Text(v))).ToArray());

    public static string Text(string? value) =>
        (value ?? "").Replace("&", "&amp;", StringComparison.Ordinal).Replace("<", "&lt;", StringComparison.Ordinal).Replace(">", "&gt;", StringComparison.Ordinal);

    /// <summary>[a, b] as a JSON array, e.g. for ranges and domains.</summary>
    public static JsonArray Pair(double a, double b) => new(JsonValue.Create(a), JsonValue.Create(b));

    public static JsonObject Marker(string colour, int size = 7, string? symbol = null)
    {
        var m = new JsonObject { ["color"] = colour, ["size"] = size };
        if (symbol is not null) m["symbol"] = symbol;
        return m;
    }

    public static JsonObject Line(string colour, double width = 2, string dash = "solid") =>
        new() { ["color"] = colour, ["width"] = width, ["dash"] = dash };

    /// <summary>The y = x line (confidence equals accuracy) on [0, 1], drawn on the given axes.</summary>
    public static JsonObject Diagonal(string xaxis = "x", string yaxis = "y", bool showLegend = true) => new()
    {
        ["type"] = "scatter", ["mode"] = "lines", ["name"] = "confidence = accuracy", ["x"] = Pair(0, 1), ["y"] = Pair(0, 1),
        ["xaxis"] = xaxis, ["yaxis"] = yaxis, ["hoverinfo"] = "skip", ["showlegend"] = showLegend,
        ["line"] = Line(Theme.Muted, 1, "dash"),
    };

    /// <summary>Percent with one decimal, invariant culture, for titles.</summary>
    public static string Pct(double v) => Html.Pct(v);
}
