using Kit.Experiments;
using Kit.Models;

namespace Kit.Tests.Experiments;

public class SweepGridTests
{
    [Fact]
    public void Grid_is_every_combination_first_key_slowest_with_stable_names()
    {
        var configs = SweepGrid.Parse("cell=gru,lstm; embed=16,64");
        Assert.Equal(["cell=gru;embed=16", "cell=gru;embed=64", "cell=lstm;embed=16", "cell=lstm;embed=64"], configs.Select(c => c.Name));
        // Names follow the kit's key order, not the typed order, so the same config always has the same name.
        Assert.Equal("cell=gru;embed=16", SweepGrid.Parse("embed=16; cell=GRU")[0].Name);
        var spec = configs[3].Apply(new RunSpec { DataPath = "x.csv", HiddenSize = 48 });
        Assert.Equal((CellKind.Lstm, 64, 48), (spec.Cell, spec.EmbeddingSize, spec.HiddenSize));
        var all = SweepGrid.Parse("layers=2; bidirectional=true; pooling=mean; epochs=3; batch=16; lr=0.01; hidden=8")[0]
            .Apply(new RunSpec { DataPath = "x.csv" });
        Assert.Equal((2, true, PoolingKind.Mean, 3, 16, 0.01, 8),
            (all.Layers, all.Bidirectional, all.Pooling, all.Training.Epochs, all.Training.BatchSize, all.Training.LearningRate, all.HiddenSize));
        Assert.Equal(["base"], SweepGrid.Parse("").Select(c => c.Name));
    }

    [Fact]
    public void Encoder_and_dropout_keys_set_the_family_and_rates_and_the_cell_key_keeps_working()
    {
        var configs = SweepGrid.Parse("encoder=gru,cnn,transformer; dropout=0,0.3");
        Assert.Equal(6, configs.Count);
        Assert.Equal("encoder=cnn;dropout=0.3", configs[3].Name);
        var basis = new RunSpec { DataPath = "x.csv", Cell = CellKind.Lstm, HiddenSize = 16 };
        var cnn = configs[3].Apply(basis).ModelConfig(30, 4);
        Assert.Equal((EncoderKind.Convolution, 0.3, 0.3, 0.3), (cnn.Encoder, cnn.EmbeddingDropout, cnn.LayerDropout, cnn.HeadDropout));
        var gru = configs[0].Apply(basis);
        Assert.Equal((EncoderKind.Recurrent, CellKind.Gru), (gru.Encoder, gru.Cell));
        // One rate set on its own wins over the shared one.
        var mixed = SweepGrid.Parse("dropout=0.2; head-dropout=0.5; heads=2; positions=learned; encoder=transformer")[0].Apply(basis).ModelConfig(30, 4);
        Assert.Equal((0.2, 0.2, 0.5, 2, PositionKind.Learned), (mixed.EmbeddingDropout, mixed.LayerDropout, mixed.HeadDropout, mixed.Heads, mixed.Positions));
        var cell = SweepGrid.Parse("cell=rnn")[0].Apply(basis);
        Assert.Equal((EncoderKind.Recurrent, CellKind.Rnn), (cell.Encoder, cell.Cell));
        // Bidirectional applies to recurrent encoders; a grid crossing it with a CNN still builds.
        var crossed = SweepGrid.Parse("encoder=cnn; bidirectional=true")[0].Apply(basis).ModelConfig(30, 4);
        Assert.False(crossed.Bidirectional);
    }

    [Theory]
    [InlineData("dropout=1", "dropout=1: expected a rate in [0, 1)")]
    [InlineData("encoder=tree", "encoder=tree: expected gru, lstm, rnn, cnn or transformer")]
    [InlineData("cell=gru,transformer", "cell=transformer: expected gru, lstm or rnn")]
    [InlineData("width=3", "unknown sweep setting 'width'")]
    [InlineData("embed=0", "embed=0: expected a positive integer")]
    [InlineData("lr=fast", "lr=fast: expected a positive number")]
    [InlineData("cell", "should look like key=value1,value2")]
    [InlineData("cell=gru; cell=lstm", "appears twice")]
    [InlineData("embed=16,16", "repeats a value")]
    public void Bad_grids_say_what_is_wrong(string grid, string message) =>
        Assert.Contains(message, Assert.Throws<ArgumentException>(() => SweepGrid.Parse(grid)).Message);

    [Fact]
    public void Plan_runs_configs_then_seeds_then_folds_with_the_baseline_once_per_fold()
    {
        var plan = new SweepPlan
        {
            Base = new RunSpec { DataPath = "x.csv", Training = new Kit.Training.TrainingOptions { Seed = 10 } },
            Configs = SweepGrid.Parse("cell=gru,rnn"), Seeds = 2, Folds = 3,
        }.Validate();
        var runs = plan.Runs();
        Assert.Equal(2 * 2 * 3 + 2 * 3, runs.Count);
        Assert.Equal("cell=gru|seed=10|fold=1/3", runs[0].Id);
        Assert.Equal("cell=gru|seed=10|fold=2/3", runs[1].Id);
        Assert.Equal("cell=gru|seed=11|fold=1/3", runs[3].Id);
        Assert.Equal(["naive-bayes|seed=10|fold=1/3", "naive-bayes|seed=10|fold=2/3", "naive-bayes|seed=10|fold=3/3",
            "logistic-regression|seed=10|fold=1/3", "logistic-regression|seed=10|fold=2/3", "logistic-regression|seed=10|fold=3/3"], runs.TakeLast(6).Select(r => r.Id));
        Assert.Equal(runs.Count, runs.Select(r => r.Id).Distinct().Count());
        Assert.Throws<ArgumentException>(() => (plan with { Folds = 1 }).Validate());
        Assert.Throws<ArgumentException>(() => (plan with { Seeds = 0 }).Validate());
    }
}
