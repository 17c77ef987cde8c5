using System.Text;
using Kit.Data;
using Kit.Experiments;

namespace Kit.Tests.Experiments;

public sealed class ResultsStoreTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-store-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    internal static RunRecord Record(string config, ulong seed, int fold, double accuracy = 0.5, int folds = 2) => new()
    {
        Id = new RunKey(config, seed, fold, folds).Id, Config = config, Settings = new Dictionary<string, string> { ["cell"] = "gru" },
        Baseline = false, Model = "test", Seed = seed, Fold = fold, Folds = folds, Parameters = 100,
        Accuracy = accuracy, MacroF1 = accuracy, BalancedAccuracy = accuracy, LogLoss = double.NaN, Brier = 0.1, Ece = 0.05, Mce = 0.1, ClasswiseEce = 0.04,
        Reliability = [new ReliabilityPoint(0, 0.5, 2, 0.4, 0.5)], ByLength = [new LengthPoint("[1, 4]", 1, 4, 2, 1)],
        Epochs = [new EpochPoint(1, 0.7, 0.6, 0.8, 0.55)], BestEpoch = 1, ClassNames = ["x", "y"],
        TestRows = [3, 5], TestLabels = [0, 1], Predicted = [0, 0], Timing = new RunTiming(1.5, 2.0, 1),
    };

    string Main => Path.Combine(_dir, ResultsStore.MainFile);

    [Fact]
    public void Records_round_trip_through_the_store_exactly()
    {
        var a = Record("cell=gru", 1, 1, 0.75);
        using (var w = new ResultsWriter(Main)) { w.Append(a); w.Append(Record("cell=gru", 1, 2)); }
        var read = ResultsStore.Read(_dir);
        Assert.Equal(2, read.Records.Count);
        Assert.Empty(read.Notes);
        Assert.Equal(a.ToJsonLine(), read.Records[0].ToJsonLine());
        Assert.True(double.IsNaN(read.Records[0].LogLoss));
        Assert.Equal(2, File.ReadAllText(Main).Count(ch => ch == '\n'));
    }

    [Fact]
    public void A_torn_final_line_is_ignored_reported_and_repaired_before_the_next_append()
    {
        using (var w = new ResultsWriter(Main)) w.Append(Record("cell=gru", 1, 1));
        string whole = Record("cell=gru", 1, 2).ToJsonLine();
        File.AppendAllText(Main, whole[..(whole.Length / 2)]); // what a kill in the middle of a write leaves
        var read = ResultsStore.Read(_dir);
        Assert.Single(read.Records);
        Assert.Contains("torn final line", Assert.Single(read.Notes));
        Assert.Contains($"{Main}:2", read.Notes[0]);

        using (var w = new ResultsWriter(Main))
        {
            Assert.Equal(Encoding.UTF8.GetByteCount(whole[..(whole.Length / 2)]), w.RepairedBytes);
            w.Append(Record("cell=gru", 1, 2));
        }
        var after = ResultsStore.Read(_dir);
        Assert.Equal(["cell=gru|seed=1|fold=1/2", "cell=gru|seed=1|fold=2/2"], after.Records.Select(r => r.Id));
        Assert.Empty(after.Notes);
    }

    [Fact]
    public void A_broken_line_that_is_not_the_last_is_an_error_naming_file_and_line()
    {
        File.WriteAllText(Main, Record("a", 1, 1).ToJsonLine() + "\n{\"id\": 3,\n" + Record("a", 1, 2).ToJsonLine() + "\n");
        var e = Assert.Throws<DataError>(() => ResultsStore.Read(_dir));
        Assert.Equal(2, e.Line);
        Assert.Equal(Main, e.File);
        Assert.Contains("not a run record", e.Message);
    }

    [Fact]
    public void The_same_run_in_two_files_is_kept_once_unless_the_results_differ()
    {
        using (var w = new ResultsWriter(Main)) w.Append(Record("a", 1, 1));
        string shard = Path.Combine(_dir, new Shard(1, 2).FileName);
        // Same results, other timing and shard: one run.
        using (var w = new ResultsWriter(shard)) w.Append(Record("a", 1, 1) with { Timing = new RunTiming(9, 9, 2), Shard = "1/2" });
        Assert.Single(ResultsStore.Read(_dir).Records);
        using (var w = new ResultsWriter(shard)) w.Append(Record("a", 1, 1, accuracy: 0.9));
        Assert.Contains("stored twice with different results", Assert.Throws<DataError>(() => ResultsStore.Read(_dir)).Message);
    }

    [Fact]
    public void Merge_writes_one_main_file_in_plan_order_and_removes_the_shards()
    {
        using (var w = new ResultsWriter(Path.Combine(_dir, new Shard(2, 2).FileName))) { w.Append(Record("a", 1, 2)); w.Append(Record("b", 1, 2)); }
        using (var w = new ResultsWriter(Path.Combine(_dir, new Shard(1, 2).FileName))) { w.Append(Record("b", 1, 1)); w.Append(Record("a", 1, 1)); }
        RunKey[] order = [new("a", 1, 1, 2), new("a", 1, 2, 2), new("b", 1, 1, 2), new("b", 1, 2, 2)];
        var merged = ResultsStore.Merge(_dir, order);
        Assert.Equal(order.Select(k => k.Id), merged.Records.Select(r => r.Id));
        Assert.Equal([Main], ResultsStore.Files(_dir));
        Assert.Equal(order.Select(k => k.Id), ResultsStore.Read(_dir).Records.Select(r => r.Id));
        // Merging again changes nothing.
        ResultsStore.Merge(_dir, order);
        Assert.Equal(4, ResultsStore.Read(_dir).Records.Count);
    }
}
