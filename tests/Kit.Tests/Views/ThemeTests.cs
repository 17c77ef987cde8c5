using Kit.Views;
using static Kit.Tests.Views.ColourDifference;

namespace Kit.Tests.Views;

/// <summary>The colour cycle keeps the promises in Theme.Palette's comment: apart for every reader, and in print.</summary>
public class ThemeTests
{
    static readonly string[] Visions = { "normal", "deuteranopia", "protanopia", "tritanopia" };
    static IReadOnlyList<string> FirstFour => Theme.Palette.Take(4).ToArray();

    [Fact]
    public void The_colour_difference_reproduces_published_test_pairs()
    {
        // Sharma, Wu & Dalal 2005 (Color Res. Appl. 30(1)), Table 1 test data; pairs and values from memory.
        (Lab, Lab, double)[] pairs =
        {
            (new(50, 2.6772, -79.7751), new(50, 0, -82.7485), 2.0425),
            (new(50, 0, 0), new(50, -1, 2), 2.3669),
            (new(50, 2.5, 0), new(73, 25, -18), 27.1492),
            (new(50, 2.5, 0), new(61, -5, 29), 22.8977),
            (new(50, 2.5, 0), new(56, -27, -3), 31.9030),
            (new(50, 2.5, 0), new(58, 24, 15), 19.4535),
        };
        foreach (var (a, b, expected) in pairs)
        {
            Assert.Equal(expected, Ciede2000(a, b), 4);
            Assert.Equal(expected, Ciede2000(b, a), 4);   // symmetric, as the paper notes
        }
        // Sanity of the conversion: sRGB white is L* = 100, a* = b* = 0 under D65.
        var white = ToLab("#FFFFFF");
        Assert.Equal(100, white.L, 3);
        Assert.Equal(0, white.A, 3);
        Assert.Equal(0, white.B, 3);
    }

    [Fact]
    public void The_simulations_keep_white_and_grey_unchanged()
    {
        foreach (var (name, m) in Deficiencies)
            for (int i = 0; i < 3; i++)
                Assert.True(Math.Abs(m[i, 0] + m[i, 1] + m[i, 2] - 1) < 2e-6, $"{name} row {i} does not sum to 1");
        foreach (var vision in Visions)
            Assert.True(Ciede2000(Seen("#808080", "normal"), Seen("#808080", vision)) < 0.01, vision);
    }

    [Fact]
    public void Every_pair_of_cycle_colours_stays_apart_with_and_without_red_green_deficiency()
    {
        // 12 ΔE00 is well past "clearly different at a glance" (common practice, no source); tritanopia is left out
        // for the whole cycle (rare, and the eight colours cannot all meet it) but held for the first four below.
        foreach (var vision in new[] { "normal", "deuteranopia", "protanopia" })
        {
            var (d, i, j) = ClosestPair(Theme.Palette, vision);
            Assert.True(d >= 12, $"{vision}: {Theme.Palette[i]} and {Theme.Palette[j]} are only ΔE00 {d:F1} apart");
        }
    }

    [Fact]
    public void The_first_four_colours_stay_apart_for_every_reader_and_in_greyscale()
    {
        foreach (var vision in Visions)
        {
            var (d, i, j) = ClosestPair(FirstFour, vision);
            Assert.True(d >= 15, $"{vision}: {FirstFour[i]} and {FirstFour[j]} are only ΔE00 {d:F1} apart");
        }
        // Print: lightness alone tells the first four apart (10 L* units, common practice, no source), and the first
        // two, drawn together as loss and metric, are far apart.
        var lightness = FirstFour.Select(c => ToLab(c).L).ToArray();
        for (int i = 0; i < 4; i++)
            for (int j = i + 1; j < 4; j++)
                Assert.True(Math.Abs(lightness[i] - lightness[j]) >= 10, $"{FirstFour[i]} and {FirstFour[j]} differ by {Math.Abs(lightness[i] - lightness[j]):F1} L*");
        Assert.True(Math.Abs(lightness[0] - lightness[1]) >= 30);
    }

    [Fact]
    public void The_cycle_does_not_open_blue_orange_green_red()
    {
        var families = FirstFour.Select(c => HueFamily(ToLab(c).Hue)).ToArray();
        Assert.NotEqual(new[] { "blue", "orange", "green", "red" }, families);
        Assert.NotEqual("blue", families[0]);
        Assert.Equal(4, families.Distinct().Count());
        // The check can fail: the kit's former cycle opened exactly that way.
        string[] former = { "#2E5E8C", "#D9822B", "#3C8D6E", "#A8443A" };
        Assert.Equal(new[] { "blue", "orange", "green", "red" }, former.Select(c => HueFamily(ToLab(c).Hue)).ToArray());
        Assert.True(ClosestPair(new[] { "#2E5E8C", "#D9822B", "#3C8D6E", "#A8443A", "#7B62A3", "#8C7A3A", "#4E9BB5", "#6B6B6B" }, "protanopia").Distance < 12,
            "the former cycle is the one the distinctness check was written against");
    }

    [Fact]
    public void Grey_closes_the_cycle_for_baselines_and_tints_carry_the_cycle_colour()
    {
        Assert.True(ToLab(Theme.Palette[^1]) is { A: > -3 and < 3, B: > -3 and < 3 }, "the last colour is a neutral grey");
        Assert.Equal("rgba(2,88,73,0.18)", Theme.Tint(0, 0.18));
        Assert.Equal(Theme.Palette[0], Theme.Colour(Theme.Palette.Length));
    }

    /// <summary>Coarse hue names by CIELAB hue angle (band edges: common practice, no source).</summary>
    static string HueFamily(double hue) => hue switch
    {
        < 45 or >= 345 => "red",
        < 75 => "orange",
        < 105 => "yellow",
        < 170 => "green",
        < 215 => "teal",
        < 290 => "blue",
        _ => "purple",
    };
}
