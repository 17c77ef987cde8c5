using System.Text.Json;
using System.Text.Json.Nodes;

namespace Kit.Views;

/// <summary>One plotly.js figure (traces + layout as JSON) with the kit's layout defaults.</summary>
public sealed class ChartView : IChartView
{
    static int _counter;

    public string Title { get; }
    public JsonArray Traces { get; }
    public JsonObject Layout { get; }
    public string? Caption { get; init; }
    public int ChartCount => 1;

    public ChartView(string title, JsonArray traces, JsonObject layout)
    {
        Title = title;
        Traces = traces;
        Layout = layout;
    }

    public string FigureJson() =>
        new JsonObject { ["data"] = Traces.DeepClone(), ["layout"] = Layout.DeepClone() }.ToJsonString(JsonOptions);

    public string ToHtml()
    {
        string id = $"kit-chart-{Interlocked.Increment(ref _counter)}-{Guid.NewGuid().ToString("N")[..6]}";
        string data = Traces.ToJsonString(JsonOptions);
        string layout = Layout.ToJsonString(JsonOptions);
        const string config = "{\"responsive\":true,\"displaylogo\":false}";
        // Deferred until plotly.js is present, so the fragment works whether the bundle comes before or after it.
        // data-kit-drawn / data-kit-error let a headless browser (tests, image export) know when the plot is done.
        string caption = Caption is null ? "" : $"<figcaption>{Html.Escape(Caption)}</figcaption>";
        return $"<figure class=\"kit-chart\"><div id=\"{id}\" class=\"kit-plot\" data-kit-chart=\"1\" data-kit-name=\"{Html.Escape(Title)}\"></div>{caption}" +
               $"<script>(function(){{var el=document.getElementById('{id}');var draw=function(){{if(window.Plotly){{" +
               $"Plotly.newPlot(el,{Safe(data)},{Safe(layout)},{config}).then(function(){{el.setAttribute('data-kit-drawn','1');}}," +
               $"function(e){{el.setAttribute('data-kit-error',String(e&&e.message||e));}});}}else{{setTimeout(draw,50);}}}};draw();}})();</script></figure>";
    }

    /// <summary>
    /// JSON for inside a script element. '&lt;', '&gt;' and '&amp;' occur in JSON only inside strings, where the
    /// \u escapes mean the same characters, so no text from the data can close the script or open a comment.
    /// </summary>
    internal static string Safe(string json) =>
        json.Replace("<", "\\u003c", StringComparison.Ordinal).Replace(">", "\\u003e", StringComparison.Ordinal).Replace("&", "\\u0026", StringComparison.Ordinal);

    internal static readonly JsonSerializerOptions JsonOptions = new() { WriteIndented = false };
}
