using System.Text.Json.Nodes;

namespace Kit.Views;

/// <summary>
/// The kit's one visual language: a muted palette chosen for print and for colour-blind readers, one font stack,
/// generous margins, and titles that say what to read off the chart.
/// </summary>
public static class Theme
{
    /// <summary>
    /// The colour cycle, in the order series take it. Chosen (ThemeTests checks each claim) so that every pair stays
    /// apart by CIEDE2000 for normal vision and under simulated deuteranopia and protanopia; the first four also
    /// under tritanopia and in lightness alone, so they survive greyscale print. The first two (loss and metric in
    /// the live progress, accuracy and macro F1 by length) are the darkest and the lightest of the four.
    /// Grey comes last: comparison charts keep it for baselines.
    /// </summary>
    public static readonly string[] Palette =
    {
        "#025849", // deep teal
        "#C4B05C", // mustard
        "#995494", // plum
        "#8B97A4", // slate
        "#C98A81", // clay
        "#727947", // olive
        "#AF98EC", // lavender
        "#6F7271", // grey
    };

    public const string Ink = "#1F2933";
    public const string Muted = "#6B7785";
    public const string Grid = "#E4E7EB";
    public const string Good = "#3C8D6E";
    public const string Bad = "#A8443A";
    /// <summary>
    /// Single-word family names only: plotly.js writes the stack into SVG style attributes without re-quoting,
    /// and a quoted name ("Segoe UI") there makes the exported SVG invalid XML (and its PNG fail to draw).
    /// </summary>
    public const string FontStack = "Inter, Roboto, Helvetica, Arial, sans-serif";

    /// <summary>Sequential scale from paper white to the deep blue, for counts and rates.</summary>
    public static JsonArray SequentialScale() => new(
        new JsonArray(0.0, "#F7F9FB"), new JsonArray(0.35, "#B9CEE0"), new JsonArray(0.7, "#5C8DB8"), new JsonArray(1.0, "#1D3F61"));

    /// <summary>Diverging scale centred on white, for signed changes (e.g. occlusion).</summary>
    public static JsonArray DivergingScale() => new(
        new JsonArray(0.0, "#A8443A"), new JsonArray(0.5, "#F7F7F7"), new JsonArray(1.0, "#2E5E8C"));

    public static string Colour(int i) => Palette[((i % Palette.Length) + Palette.Length) % Palette.Length];

    /// <summary>Cycle colour <paramref name="i"/> at the given opacity, for bands and fills.</summary>
    public static string Tint(int i, double opacity)
    {
        string hex = Colour(i);
        int r = Convert.ToInt32(hex[1..3], 16), g = Convert.ToInt32(hex[3..5], 16), b = Convert.ToInt32(hex[5..7], 16);
        return string.Create(System.Globalization.CultureInfo.InvariantCulture, $"rgba({r},{g},{b},{opacity:0.##})");
    }

    /// <summary>Pixels from the chart's top edge to the middle of the title's first line.</summary>
    public const double TitleLine = 20;
    /// <summary>Top margins that clear a one-line and a two-line title.</summary>
    public const int OneLineTop = 52, TwoLineTop = 76;

    /// <summary>Layout defaults for one chart. Title and axis titles are plain text (entity-encoded here).</summary>
    public static JsonObject Layout(string title, string xTitle, string yTitle, int height = 380)
    {
        return new JsonObject
        {
            // Placed in pixels from the top edge: plotly anchors a two-line title by its first line, so an anchor
            // at the top cuts that line and automatic margins leave the second over the plot in image export.
            ["title"] = new JsonObject
            {
                ["text"] = TitleMarkup(title), ["x"] = 0.0, ["xanchor"] = "left", ["xref"] = "paper",
                ["y"] = 1 - TitleLine / height, ["yanchor"] = "middle", ["yref"] = "container",
                ["font"] = new JsonObject { ["size"] = 15, ["color"] = Ink },
            },
            ["font"] = new JsonObject { ["family"] = FontStack, ["size"] = 12, ["color"] = Ink },
            ["paper_bgcolor"] = "#FFFFFF",
            ["plot_bgcolor"] = "#FFFFFF",
            ["height"] = height,
            ["margin"] = new JsonObject { ["l"] = 64, ["r"] = 24, ["t"] = title.Contains(" — ", StringComparison.Ordinal) ? TwoLineTop : OneLineTop, ["b"] = 56 },
            ["xaxis"] = Axis(xTitle),
            ["yaxis"] = Axis(yTitle),
            // Beside the plot, top right: it never collides with an axis title, however the ticks are turned.
            ["legend"] = new JsonObject { ["orientation"] = "v", ["x"] = 1.02, ["xanchor"] = "left", ["y"] = 1.0, ["yanchor"] = "top",
                ["font"] = new JsonObject { ["size"] = 11 } },
            ["hoverlabel"] = new JsonObject { ["font"] = new JsonObject { ["family"] = FontStack } },
        };
    }

    /// <summary>
    /// Titles follow one pattern: what the chart is, then " — " and what to read off it. The second part goes on
    /// its own line in smaller, muted type, so long readings never run past the chart's edge.
    /// </summary>
    public static string TitleMarkup(string title)
    {
        int cut = title.IndexOf(" — ", StringComparison.Ordinal);
        if (cut < 0) return $"<b>{Figure.Text(title)}</b>";
        return $"<b>{Figure.Text(title[..cut])}</b><br><span style=\"font-size:12px;color:{Muted}\">{Figure.Text(title[(cut + 3)..])}</span>";
    }

    public static JsonObject Axis(string title) => new()
    {
        // The standoff keeps the title clear of long tick labels (class names) when margins grow to fit them.
        ["title"] = new JsonObject { ["text"] = Figure.Text(title), ["standoff"] = 10 },
        ["gridcolor"] = Grid,
        ["zerolinecolor"] = Grid,
        ["linecolor"] = Muted,
        ["ticks"] = "outside",
        ["tickcolor"] = Muted,
        ["automargin"] = true,
    };
}
