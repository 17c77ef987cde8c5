using System.Text.Json.Nodes;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>2-D pictures of learned vectors: token embeddings (labelled by token) and pooled sequences (by class and correctness).</summary>
public static class ProjectionViews
{
    /// <summary>Above this many tokens the labels would pile up, so only hover shows them.</summary>
    public const int MaxLabelledTokens = 150;

    public static ChartView Tokens(Projection p, string what = "token embeddings")
    {
        bool labelled = p.Points.Count <= MaxLabelledTokens;
        var trace = new JsonObject
        {
            ["type"] = "scatter", ["mode"] = labelled ? "markers+text" : "markers", ["name"] = "token",
            ["x"] = Figure.Numbers(p.Points.Select(q => q.X)), ["y"] = Figure.Numbers(p.Points.Select(q => q.Y)),
            ["text"] = Figure.Texts(p.Points.Select(q => Visible(q.Text))), ["textposition"] = "top center",
            ["textfont"] = new JsonObject { ["size"] = 11, ["color"] = Theme.Ink },
            ["marker"] = Figure.Marker(Theme.Colour(0), 6), ["hovertemplate"] = "token %{text}<extra></extra>",
        };
        var (xTitle, yTitle) = AxisTitles(p);
        var layout = Theme.Layout($"{Capital(what)}, {Method(p)} — tokens the model treats alike sit close together", xTitle, yTitle, height: 520);
        layout["showlegend"] = false;
        return new ChartView($"Projection of {what}", new JsonArray(trace), layout)
        {
            Caption = p.Method == ProjectionMethod.Pca && p.VarianceShare.Count >= 2
                ? $"The two axes keep {Html.Pct(p.VarianceShare[0] + p.VarianceShare[1])} of the variance; what is far apart here is far apart in the embedding, not necessarily the reverse."
                : null,
        };
    }

    /// <summary>One colour per true class, circle = predicted right, cross = predicted wrong, the sequence on hover.</summary>
    public static ChartView Sequences(Projection p, string what = "pooled test representations")
    {
        var traces = new JsonArray();
        var classes = p.Points.Select(q => q.Label ?? "").Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).ToArray();
        for (int c = 0; c < classes.Length; c++)
        {
            // Right and wrong rows of a class are two traces in one legend group, so the class's legend entry
            // shows a plain circle (never the cross that means "wrong") and one click hides both.
            var members = p.Points.Where(q => (q.Label ?? "") == classes[c]).ToArray();
            bool legendShown = false;
            foreach (var wrongRows in new[] { false, true })
            {
                var pts = members.Where(q => (q.Correct == false) == wrongRows).ToArray();
                if (pts.Length == 0) continue;
                traces.Add(new JsonObject
                {
                    ["type"] = "scatter", ["mode"] = "markers", ["name"] = Figure.Text(classes[c]), ["legendgroup"] = $"class:{c}",
                    ["showlegend"] = !legendShown, ["legendrank"] = c + 1,
                    ["x"] = Figure.Numbers(pts.Select(q => q.X)), ["y"] = Figure.Numbers(pts.Select(q => q.Y)),
                    ["text"] = Figure.Texts(pts.Select(q => Visible(q.Text))),
                    ["marker"] = new JsonObject
                    {
                        ["color"] = Theme.Colour(c), ["size"] = wrongRows ? 8 : 6, ["opacity"] = wrongRows ? 0.95 : 0.75,
                        ["symbol"] = wrongRows ? "x" : "circle", ["line"] = new JsonObject { ["width"] = 0 },
                    },
                    ["hovertemplate"] = $"%{{text}}<br>true class {Figure.Text(classes[c])}<br>prediction {(wrongRows ? "wrong" : pts[0].Correct is null ? "not scored" : "right")}<extra></extra>",
                });
                legendShown = true;
            }
        }
        int wrong = p.Points.Count(q => q.Correct == false);
        // Two grey entries explain the symbols; they hold no points.
        foreach (var (name, symbol) in new[] { ("predicted right", "circle"), ("predicted wrong", "x") })
            traces.Add(new JsonObject
            {
                ["type"] = "scatter", ["mode"] = "markers", ["name"] = name, ["legendgroup"] = "symbol", ["legendrank"] = 1000, ["x"] = new JsonArray((JsonNode?)null),
                ["y"] = new JsonArray((JsonNode?)null), ["marker"] = Figure.Marker(Theme.Muted, 8, symbol), ["hoverinfo"] = "skip",
            });
        var (xTitle, yTitle) = AxisTitles(p);
        var layout = Theme.Layout(
            $"{Capital(what)}, {Method(p)} — colour is the true class, crosses are the {wrong} wrong predictions among {p.Points.Count} rows",
            xTitle, yTitle, height: 560);
        layout["legend"]!["tracegroupgap"] = 14;
        return new ChartView($"Projection of {what}", traces, layout)
        {
            Caption = p.Method == ProjectionMethod.Tsne
                ? "t-SNE keeps neighbourhoods, not distances: tight clusters mean similar vectors, but gaps between clusters and cluster sizes carry no meaning."
                : null,
        };
    }

    static (string X, string Y) AxisTitles(Projection p) => p.Method == ProjectionMethod.Pca && p.VarianceShare.Count >= 2
        ? ($"PC 1 ({Html.Pct(p.VarianceShare[0])} of variance; embedding units)", $"PC 2 ({Html.Pct(p.VarianceShare[1])} of variance; embedding units)")
        : ("t-SNE 1 (arbitrary units)", "t-SNE 2 (arbitrary units)");

    static string Method(Projection p) => p.Method == ProjectionMethod.Pca ? "PCA" : "t-SNE";

    static string Capital(string s) => s.Length == 0 ? s : char.ToUpperInvariant(s[0]) + s[1..];

    /// <summary>White space tokens would vanish on the chart; show them by name.</summary>
    internal static string Visible(string? token) => token switch
    {
        null => "",
        " " => "␣",
        "\t" => "⇥",
        "\n" => "↵",
        _ => token,
    };
}
