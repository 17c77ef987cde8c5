using System.Text.RegularExpressions;
using Kit.Data;
using Kit.Experiments;
using Kit.Models;
using Kit.Training;

namespace Kit.Tests.Experiments;

/// <summary>One vocabulary of run settings: the spec, the grid and the command lines agree on names, values and defaults.</summary>
public sealed class RunSettingsTests
{
    [Fact]
    public void Every_setting_reads_back_what_it_writes_and_its_default_is_the_spec_default()
    {
        var probe = new Dictionary<string, string>
        {
            ["cell"] = "lstm", ["encoder"] = "transformer", ["heads"] = "2", ["positions"] = "learned", ["dropout"] = "0.3",
            ["embed-dropout"] = "0.1", ["layer-dropout"] = "0.2", ["head-dropout"] = "0.4", ["embed"] = "12", ["hidden"] = "40", ["layers"] = "2", ["bidirectional"] = "true", ["pooling"] = "max",
            ["epochs"] = "3", ["batch"] = "16", ["lr"] = "0.01", ["optimizer"] = "sgd", ["schedule"] = "warmup-cosine",
            ["weight-decay"] = "0.001", ["clip"] = "2", ["class-weights"] = "inverse", ["label-smoothing"] = "0.1",
            ["keep-best-by"] = "macro-f1", ["stop-after"] = "2", ["seed"] = "9", ["threads"] = "1", ["tokenizer"] = "character-folded",
            ["max-length"] = "20", ["truncation"] = "tail", ["min-count"] = "2", ["sample"] = "500", ["holdout"] = "0.6/0.2/0.2", ["split-seed"] = "4",
        };
        Assert.Equal(probe.Keys.Order(), RunSettings.All.Select(s => s.Key).Order());
        foreach (var setting in RunSettings.All)
        {
            var spec = setting.Apply(RunSettings.Defaults, probe[setting.Key]);
            Assert.Equal(probe[setting.Key], setting.Read(spec));
            Assert.NotEqual(setting.Default, setting.Read(spec));
            Assert.Throws<ArgumentException>(() => setting.Apply(RunSettings.Defaults, "not-a-value"));
        }
        var all = RunSettings.All.Aggregate(RunSettings.Defaults, (s, k) => k.Apply(s, probe[k.Key]));
        Assert.Equal((CellKind.Lstm, 2, true, PoolingKind.Max), (all.Cell, all.Layers, all.Bidirectional, all.Pooling));
        Assert.Equal((EncoderKind.Transformer, 2, PositionKind.Learned, 0.3, 0.1), (all.Encoder, all.Heads, all.Positions, all.Dropout, all.EmbeddingDropout));
        Assert.Equal((OptimizerKind.Sgd, ScheduleKind.WarmupCosine, 2.0, 2), (all.Training.Optimizer, all.Training.Schedule.Kind, all.Training.MaxGradientNorm, all.Training.Patience));
        Assert.Equal((TokenizerKind.Character, true, TruncationPolicy.KeepTail, 0.6, 4UL), (all.Tokenizer, all.FoldCase, all.Truncation, all.TrainFraction, all.SplitSeed));
        Assert.Equal(MonitorMetric.ValidationMacroF1, all.Training.Monitor);
    }

    [Fact]
    public void Grid_keys_are_the_model_and_training_settings_and_data_settings_are_refused_in_a_grid()
    {
        // The keys config names were written with before keep their order, so stored names stay the same.
        string[] first = ["cell", "embed", "hidden", "layers", "bidirectional", "pooling", "epochs", "batch", "lr"];
        Assert.Equal(first, SweepConfig.Keys.Select(k => k.Key).Where(first.Contains));
        Assert.Equal("cell=lstm;embed=16;lr=0.01", SweepGrid.Parse("lr=0.01; embed=16; cell=lstm")[0].Name);
        var config = SweepGrid.Parse("optimizer=adamw; stop-after=2")[0];
        Assert.Equal("optimizer=adamw;stop-after=2", config.Name);
        var spec = config.Apply(RunSettings.Defaults);
        Assert.Equal((OptimizerKind.AdamW, 2), (spec.Training.Optimizer, spec.Training.Patience));
        var e = Assert.Throws<ArgumentException>(() => SweepGrid.Parse("max-length=20,30"));
        Assert.Contains("--max-length", e.Message);
        Assert.Throws<ArgumentException>(() => SweepGrid.Parse("seed=1,2"));
    }

    static HashSet<string> OptionsInHelp(string command)
    {
        var output = new StringWriter();
        int code = Kit.Cli.Program.BuildRoot().Parse([command, "--help"]).Invoke(new System.CommandLine.InvocationConfiguration { Output = output });
        Assert.Equal(0, code);
        return Regex.Matches(output.ToString(), @"^\s+(--[a-z0-9-]+)", RegexOptions.Multiline).Select(m => m.Groups[1].Value).ToHashSet();
    }

    [Fact]
    public void Train_and_compare_help_list_the_same_shared_options_and_inspect_lists_the_data_ones()
    {
        var train = OptionsInHelp("train");
        var compare = OptionsInHelp("compare");
        var inspect = OptionsInHelp("inspect");
        var shared = RunSettings.All.Select(s => "--" + s.Key).Concat(["--text", "--label", "--group", "--split-column"]).ToArray();
        Assert.All(shared, o => Assert.Contains(o, train));
        Assert.All(shared, o => Assert.Contains(o, compare));
        // Beyond the shared set, each has only its own few.
        Assert.Equal(["--baselines", "--out", "--resume"], train.Except(shared).Except(["--help"]).Order());
        Assert.Equal(["--budget", "--folds", "--grid", "--out", "--search", "--seeds", "--shard", "--workers"], compare.Except(shared).Except(["--help"]).Order());
        Assert.All(RunSettings.All.Where(s => s.Scope == SettingScope.Data), s => Assert.Contains("--" + s.Key, inspect));
        Assert.DoesNotContain("--epochs", inspect);
    }

    [Theory]
    [InlineData("train")]
    [InlineData("compare")]
    [InlineData("inspect")]
    [InlineData("score")]
    public void An_unknown_option_exits_with_2(string command)
    {
        var errors = new StringWriter();
        string[] args = command == "score" ? [command, "m.kitmodel", "d.csv", "--out", "o.csv", "--no-such-flag"] : [command, "d.csv", "--out", "o", "--no-such-flag"];
        if (command == "inspect") args = [command, "d.csv", "--no-such-flag"];
        int code = Kit.Cli.CliErrors.Invoke(Kit.Cli.Program.BuildRoot(), args, new System.CommandLine.InvocationConfiguration { Error = errors, Output = TextWriter.Null });
        Assert.Equal(2, code);
        Assert.Contains("--no-such-flag", errors.ToString());
    }

    [Fact]
    public void A_bad_value_exits_with_2_naming_the_flag()
    {
        var (code, _, err) = KitCli.Run(["train", KitCli.DemoHostnames, "--holdout", "0.5/0.5/0.5", "--out", Path.Combine(Path.GetTempPath(), "kit-never-" + Guid.NewGuid().ToString("N"))]);
        Assert.Equal(2, code);
        Assert.Contains("--holdout 0.5/0.5/0.5", err);
        (code, _, err) = KitCli.Run(["compare", KitCli.DemoHostnames, "--grid", "cell=gru", "--epochs", "zero", "--out", Path.Combine(Path.GetTempPath(), "kit-never-" + Guid.NewGuid().ToString("N"))]);
        Assert.Equal(2, code);
        Assert.Contains("--epochs zero", err);
    }
}
