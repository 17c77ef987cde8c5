using Kit.Experiments;

namespace Kit.Tests.Experiments;

public class ConfigLabelsTests
{
    static ConfigLabels.Entry Neural(params (string Key, string Value)[] settings)
    {
        var config = SweepConfig.Of(settings);
        return new ConfigLabels.Entry(config.Name, config.Settings, false);
    }

    static ConfigLabels.Entry Baseline(string name) => new(name, new Dictionary<string, string>(), true);

    [Fact]
    public void Configs_are_named_by_the_keys_that_vary_and_baselines_by_what_they_are()
    {
        var grid = SweepGrid.Parse("cell=gru,lstm; embed=32; hidden=128; bidirectional=true,false")
            .Select(c => new ConfigLabels.Entry(c.Name, c.Settings, false))
            .Append(Baseline(SweepConfig.BaselineName)).Append(Baseline(SweepConfig.LinearBaselineName)).ToArray();
        var labels = ConfigLabels.Of(grid);
        Assert.Equal("gru · bi", labels["cell=gru;embed=32;hidden=128;bidirectional=true"]);
        Assert.Equal("lstm · uni", labels["cell=lstm;embed=32;hidden=128;bidirectional=false"]);
        Assert.Equal("naive Bayes", labels[SweepConfig.BaselineName]);
        Assert.Equal("logistic regression", labels[SweepConfig.LinearBaselineName]);
        Assert.Equal(grid.Length, labels.Values.Distinct().Count());

        var sizes = ConfigLabels.Of(SweepGrid.Parse("hidden=128,64; dropout=0.2,0").Select(c => new ConfigLabels.Entry(c.Name, c.Settings, false)).ToArray());
        Assert.Equal("h128 · d0.2", sizes["hidden=128;dropout=0.2"]);
        Assert.Equal("h64 · d0", sizes["hidden=64;dropout=0"]);
    }

    [Fact]
    public void A_key_one_config_leaves_out_counts_at_its_default()
    {
        string hidden = RunSettings.Find("hidden").Default;
        var labels = ConfigLabels.Of([Neural(("cell", "gru")), Neural(("cell", "gru"), ("hidden", hidden == "64" ? "32" : "64"))]);
        Assert.Equal("h" + hidden, labels["cell=gru"]);
        // Setting a key to its default changes no value, so nothing varies: each is named by what it sets, still uniquely.
        var same = ConfigLabels.Of([Neural(("cell", "gru")), Neural(("cell", "gru"), ("hidden", hidden))]);
        Assert.Equal("gru", same["cell=gru"]);
        Assert.Equal($"gru · h{hidden}", same[$"cell=gru;hidden={hidden}"]);
        // Labels that would collide fall back to the full names.
        var clash = ConfigLabels.Of([new ConfigLabels.Entry("x", new Dictionary<string, string> { ["cell"] = "gru" }, false),
            new ConfigLabels.Entry("y", new Dictionary<string, string> { ["cell"] = "gru" }, false)]);
        Assert.Equal(("x", "y"), (clash["x"], clash["y"]));
    }

    [Fact]
    public void A_lone_config_is_named_by_what_it_sets()
    {
        var labels = ConfigLabels.Of([Neural(("cell", "lstm"), ("layers", "2")), Baseline(SweepConfig.BaselineName)]);
        Assert.Equal("lstm · 2 layers", labels["cell=lstm;layers=2"]);
        Assert.Equal("base", ConfigLabels.Of([new ConfigLabels.Entry("base", new Dictionary<string, string>(), false)])["base"]);
    }
}
