using Kit.Experiments;

namespace Kit.Tests.Experiments;

/// <summary>Search spaces (lists and ranges), seeded sampling, the successive-halving schedule and the budget rules.</summary>
public class SearchSpaceTests
{
    [Fact]
    public void Lists_and_ranges_parse_with_their_scales()
    {
        var space = SearchSpace.Parse("encoder=gru,lstm,cnn,transformer; hidden=32..256:log; dropout=0..0.5; lr=1e-3..1e-2:log; layers=1..3");
        Assert.Equal(["encoder", "hidden", "dropout", "lr", "layers"], space.Axes.Select(a => a.Key));
        Assert.Equal(["gru", "lstm", "cnn", "transformer"], Assert.IsType<ListAxis>(space.Axes[0]).Values);
        Assert.Equal(new RangeAxis("hidden", 32, 256, Log: true, Integer: true), space.Axes[1]);
        Assert.Equal(new RangeAxis("dropout", 0, 0.5, Log: false, Integer: false), space.Axes[2]);
        Assert.Equal(new RangeAxis("lr", 1e-3, 1e-2, Log: true, Integer: false), space.Axes[3]);
        Assert.True(space.HasRanges);
        Assert.Equal("encoder=gru,lstm,cnn,transformer; hidden=32..256:log; dropout=0..0.5; lr=0.001..0.01:log; layers=1..3", space.Describe());
        Assert.False(SearchSpace.Parse("encoder=gru,lstm").HasRanges);
    }

    [Fact]
    public void Drawn_values_round_so_names_stay_short()
    {
        var hidden = new RangeAxis("hidden", 32, 256, true, true);
        Assert.Equal("80", hidden.Format(77.3));   // sizes: nearest multiple of 8
        Assert.Equal("32", hidden.Format(30));     // kept inside the range
        Assert.Equal("256", hidden.Format(259.9));
        var layers = new RangeAxis("layers", 1, 3, false, true);
        Assert.Equal("3", layers.Format(2.5));     // other integers: nearest, halves away from zero
        Assert.Equal("1", layers.Format(1.49));
        var lr = new RangeAxis("lr", 1e-3, 1e-2, true, false);
        Assert.Equal("0.0032", lr.Format(0.0031622));  // two significant digits
        Assert.Equal("0.001", lr.Format(0.00099));     // rounded, then kept inside the range
        var dropout = new RangeAxis("dropout", 0, 0.5, false, false);
        Assert.Equal("0.12", dropout.Format(0.1234));
        Assert.Equal("0", dropout.Format(0));
        // The ends of the unit interval map to the ends of the range; a log range's middle is the geometric mean.
        Assert.Equal(32, hidden.Value(0), 9);
        Assert.Equal(Math.Sqrt(32 * 256), hidden.Value(0.5), 9);
        Assert.Equal(0.25, dropout.Value(0.5), 12);
    }

    [Theory]
    [InlineData("hidden=256..32", "must be below")]
    [InlineData("lr=0..1e-2:log", "positive low end")]
    [InlineData("hidden=32..64:sqrt", "only ':log'")]
    [InlineData("encoder=gru..lstm", "needs a list of values")]
    [InlineData("hidden=a..64", "two numbers")]
    [InlineData("dropout=0..1.5", "outside it")]
    [InlineData("epochs=1..9", "successive halving sets each rung's epochs")]
    [InlineData("tokenizer=word,character", "fixed for the whole sweep")]
    [InlineData("colour=1..2", "unknown sweep setting")]
    [InlineData("hidden=32..64; hidden=8", "appears twice")]
    [InlineData("hidden", "should look like")]
    public void Bad_spaces_are_refused_with_the_part_named(string text, string message)
    {
        var e = Assert.Throws<ArgumentException>(() => SearchSpace.Parse(text));
        Assert.Contains(message, e.Message);
    }

    [Fact]
    public void A_plain_grid_refuses_ranges_and_points_to_search()
    {
        var e = Assert.Throws<ArgumentException>(() => SweepGrid.Parse("cell=gru; hidden=32..64"));
        Assert.Contains("--search", e.Message);
    }

    [Fact]
    public void Sampling_is_seeded_distinct_and_inside_the_space()
    {
        var space = SearchSpace.Default;
        var a = space.Sample(12, 7).Select(c => c.Name).ToArray();
        var b = space.Sample(12, 7).Select(c => c.Name).ToArray();
        var c = space.Sample(12, 8).Select(c => c.Name).ToArray();
        Assert.Equal(a, b);
        Assert.NotEqual(a, c);
        Assert.Equal(12, a.Distinct().Count());
        foreach (var config in space.Sample(200, 3))
        {
            int hidden = int.Parse(config.Settings["hidden"]);
            Assert.InRange(hidden, 32, 256);
            Assert.Equal(0, hidden % 8);
            Assert.InRange(double.Parse(config.Settings["dropout"], System.Globalization.CultureInfo.InvariantCulture), 0, 0.5);
            Assert.InRange(double.Parse(config.Settings["lr"], System.Globalization.CultureInfo.InvariantCulture), 1e-3, 1e-2);
            Assert.Contains(config.Settings["encoder"], new[] { "gru", "lstm", "cnn", "transformer" });
        }
        Assert.Contains("holds only 4 distinct configs", Assert.Throws<ArgumentException>(() => SearchSpace.Parse("encoder=gru,lstm; bidirectional=true,false").Sample(5, 1)).Message);
        Assert.Equal(4, SearchSpace.Parse("encoder=gru,lstm; bidirectional=true,false").Sample(4, 1).Select(x => x.Name).Distinct().Count());
    }

    // A log-uniform draw on [a, b] has a logarithm uniform on [ln a, ln b] (the definition of the log-uniform
    // distribution), so a quarter of the draws fall in each quarter of the log range. 4,000 draws: each count's
    // binomial SD is √(4000 · ¼ · ¾) ≈ 27, so ±120 is more than 4 SD.
    [Fact]
    public void A_log_range_puts_each_factor_equally_often()
    {
        var axis = Assert.IsType<RangeAxis>(SearchSpace.Parse("lr=1e-4..1e-0:log").Axes[0]);
        var rng = new Kit.Common.SplitMix64(11);
        var counts = new int[4];
        for (int i = 0; i < 4000; i++)
        {
            double lr = double.Parse(axis.Draw(rng), System.Globalization.CultureInfo.InvariantCulture);
            counts[Math.Clamp((int)Math.Floor(Math.Log10(lr) + 4), 0, 3)]++;
        }
        Assert.All(counts, n => Assert.InRange(n, 1000 - 120, 1000 + 120));
    }

    // Successive halving, Jamieson & Talwalkar (2016), Algorithm 1, and its use with η = 3 in Li et al. (2018):
    // rung k keeps ⌊N/η^k⌋ configs and gives them η^k times the first rung's budget. Computed by hand here.
    [Theory]
    [InlineData(12, 9, "12x1 4x3 1x9")]
    [InlineData(12, 8, "12x1 4x3 1x8")]
    [InlineData(12, 20, "12x3 4x9 1x20")]
    [InlineData(27, 27, "27x1 9x3 3x9 1x27")]
    [InlineData(4, 3, "4x1 1x3")]
    [InlineData(12, 2, "12x1 4x2")]
    [InlineData(12, 1, "12x1")]
    [InlineData(2, 5, "2x5")]
    public void The_schedule_matches_a_hand_computation(int configs, int epochs, string expected)
    {
        var rungs = SuccessiveHalving.Schedule(configs, epochs);
        Assert.Equal(expected, string.Join(" ", rungs.Select(r => $"{r.Configs}x{r.Epochs}")));
        Assert.Equal(Enumerable.Range(0, rungs.Count), rungs.Select(r => r.Rung));
    }

    [Fact]
    public void Promotion_ranks_by_validation_and_breaks_ties_by_draw_order()
    {
        var rung = new[] { ("a", 0.7), ("b", 0.9), ("c", 0.7), ("d", double.NaN), ("e", 0.8) };
        Assert.Equal(["b", "e"], SuccessiveHalving.Promote(rung, 2));
        Assert.Equal(["b", "e", "a", "c"], SuccessiveHalving.Promote(rung, 4));
    }

    [Fact]
    public void The_budget_runs_shrinks_or_stops_a_rung()
    {
        // 4 configs at 2.5 s per epoch each = 10 s per rung epoch on one lane; 9 epochs planned after 3.
        Assert.Equal(new BudgetCall(false, 9, 90, "fits: about 90 s of 200 s left"), SuccessiveHalving.Fit(9, 3, 10, 1, 200));
        var shrunk = SuccessiveHalving.Fit(9, 3, 10, 1, 65);
        Assert.False(shrunk.Stop);
        Assert.Equal(6, shrunk.Epochs);
        Assert.Contains("shrunk to 6 epochs", shrunk.Note);
        Assert.Equal(9, SuccessiveHalving.Fit(9, 3, 10, 2, 45).Epochs); // two shards: half the wall time
        var stop = SuccessiveHalving.Fit(9, 3, 10, 1, 35);
        Assert.True(stop.Stop);
        Assert.Contains("search stopped", stop.Note);
        Assert.True(SuccessiveHalving.Fit(9, 3, 10, 1, -5).Stop);
    }

    [Theory]
    [InlineData("15m", 900)]
    [InlineData("90s", 90)]
    [InlineData("1h", 3600)]
    [InlineData("1h30m", 5400)]
    [InlineData("2.5m", 150)]
    public void Budgets_parse(string text, double seconds) => Assert.Equal(seconds, SuccessiveHalving.ParseBudget(text).TotalSeconds);

    [Theory]
    [InlineData("15")]
    [InlineData("m")]
    [InlineData("0s")]
    [InlineData("-5m")]
    [InlineData("15 minutes")]
    public void Bad_budgets_are_refused(string text) =>
        Assert.Contains("--budget", Assert.Throws<ArgumentException>(() => SuccessiveHalving.ParseBudget(text)).Message);
}
