using System.Globalization;
using System.Text.Json.Nodes;

namespace Kit.Tests.Training;

/// <summary>`kit train` and `kit score` end to end on a few hundred demo rows.</summary>
[Collection(EngineRandomCollection.Name)]
public sealed class TrainCommandTests : IDisposable
{
    readonly string _dir = Path.Combine(Path.GetTempPath(), "kit-train-cli-" + Guid.NewGuid().ToString("N"));

    public TrainCommandTests() => Directory.CreateDirectory(_dir);

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    string Sample()
    {
        string source = Path.Combine(Kit.Tests.DemoData.DemoDataTests.RepoRoot(), "data-demo", Kit.DemoData.DemoFiles.Hostnames);
        string path = Path.Combine(_dir, "sample.csv");
        File.WriteAllLines(path, File.ReadLines(source).Take(361));
        return path;
    }

    int Train(string data, string outDir) => Kit.Cli.Program.Main(new[]
    {
        "train", data, "--group", "group", "--epochs", "2", "--embed", "8", "--hidden", "16", "--batch", "32",
        "--schedule", "warmup-cosine", "--optimizer", "adamw", "--clip", "1", "--seed", "3", "--out", outDir,
    });

    [Fact]
    public void Same_seed_writes_byte_identical_metrics_and_bundle_then_scores_every_row()
    {
        string data = Sample();
        string a = Path.Combine(_dir, "a"), b = Path.Combine(_dir, "b");
        Assert.Equal(0, Train(data, a));
        Assert.Equal(0, Train(data, b));
        Assert.Equal(File.ReadAllBytes(Path.Combine(a, "metrics.json")), File.ReadAllBytes(Path.Combine(b, "metrics.json")));
        Assert.Equal(File.ReadAllBytes(Path.Combine(a, "model.kitmodel")), File.ReadAllBytes(Path.Combine(b, "model.kitmodel")));
        foreach (var f in new[] { "timings.json", "report.html", "checkpoints/resume-state.kit" }) Assert.True(File.Exists(Path.Combine(a, f)), f);

        var metrics = JsonNode.Parse(File.ReadAllText(Path.Combine(a, "metrics.json")))!;
        Assert.Equal(2, metrics["history"]!.AsArray().Count);
        Assert.DoesNotContain("seconds", File.ReadAllText(Path.Combine(a, "metrics.json")), StringComparison.OrdinalIgnoreCase);
        Assert.True((double)metrics["calibration"]!["temperature"]! > 0);
        // The flat test-split summary carries the names scripts rely on, equal to the detailed fields.
        foreach (var key in new[] { "macro_f1", "log_loss", "brier", "ece", "temperature", "ece_after_temperature" })
            Assert.True(metrics[key] is not null, $"metrics.json lacks {key}");
        Assert.Equal((double)metrics["test"]!["macroF1"]!, (double)metrics["macro_f1"]!);
        Assert.Equal((double)metrics["calibration"]!["temperature"]!, (double)metrics["temperature"]!);
        Assert.InRange((double)metrics["ece"]!, 0.0, 1.0);
        Assert.InRange((double)metrics["ece_after_temperature"]!, 0.0, 1.0);

        string toScore = Path.Combine(_dir, "score.csv");
        File.WriteAllText(toScore, "text,label\nabc-7f3e.example,x\n\u00c6\u00d8\u00c5\u00c6,y\nzeta01.example,z\n");
        string output = Path.Combine(_dir, "scores.csv");
        Assert.Equal(0, Kit.Cli.Program.Main(new[] { "score", Path.Combine(a, "model.kitmodel"), toScore, "--out", output, "--label", "label" }));
        var lines = File.ReadAllLines(output);
        var header = lines[0].Split(',');
        Assert.Equal(new[] { "line", "label", "predicted", "flag", "tokens", "truncated" }, header[..6]);
        var classes = metrics["data"]!["classes"]!.AsArray().Select(c => "p_" + (string)c!).ToArray();
        Assert.Equal(classes, header[6..]);
        Assert.Equal(4, lines.Length);
        foreach (int row in new[] { 1, 3 })
        {
            var cells = lines[row].Split(',');
            var p = cells[6..].Select(c => double.Parse(c, CultureInfo.InvariantCulture)).ToArray();
            Assert.Equal(1.0, p.Sum(), 9);
            Assert.Equal(classes[Array.IndexOf(p, p.Max())], "p_" + cells[2]);
            Assert.Equal("", cells[3]);
        }
        // Letters the character vocabulary never saw: flagged, no guess.
        Assert.Equal("3,y,,all-unknown,4,false,", string.Join(',', lines[2].Split(',')[..7]));
    }

    [Fact]
    public void Train_with_baselines_and_a_cnn_encoder_saves_baseline_files_that_score_reads()
    {
        string data = Sample();
        string dir = Path.Combine(_dir, "cnn");
        Assert.Equal(0, Kit.Cli.Program.Main(new[]
        {
            "train", data, "--group", "group", "--epochs", "1", "--embed", "8", "--hidden", "8", "--encoder", "cnn", "--pooling", "max",
            "--dropout", "0.2", "--baselines", "--out", dir,
        }));
        var config = JsonNode.Parse(File.ReadAllText(Path.Combine(dir, "metrics.json")))!["model"]!;
        Assert.Equal(("Convolution", 0.2, 0.2, 0.2), ((string)config["Encoder"]!, (double)config["EmbeddingDropout"]!, (double)config["LayerDropout"]!, (double)config["HeadDropout"]!));
        Assert.Contains("CNN widths 2/3/4/5", File.ReadAllText(Path.Combine(dir, "report.html")));
        Assert.Contains("dropout 0.2", File.ReadAllText(Path.Combine(dir, "report.html")));
        string toScore = Path.Combine(_dir, "score.csv");
        File.WriteAllText(toScore, "text,label\nabc-7f3e.example,x\n\u00c6\u00d8\u00c5\u00c6,y\n");
        foreach (var file in new[] { "naive-bayes.kitngram", "logistic-regression.kitngram" })
        {
            string output = Path.Combine(_dir, file + ".csv");
            Assert.Equal(0, Kit.Cli.Program.Main(new[] { "score", Path.Combine(dir, file), toScore, "--out", output, "--label", "label" }));
            var lines = File.ReadAllLines(output);
            var cells = lines[1].Split(',');
            var p = cells[6..].Select(c => double.Parse(c, CultureInfo.InvariantCulture)).ToArray();
            Assert.Equal(1.0, p.Sum(), 9);
            Assert.Equal("", cells[3]);
            Assert.Equal("3,y,,all-unknown", string.Join(',', lines[2].Split(',')[..4]));
        }
    }

    [Fact]
    public void A_corrupted_bundle_is_refused_with_exit_code_2()
    {
        string bundle = Path.Combine(_dir, "bad.kitmodel");
        File.WriteAllBytes(bundle, "KITMODEL"u8.ToArray().Concat(new byte[100]).ToArray());
        string data = Path.Combine(_dir, "x.csv");
        File.WriteAllText(data, "text,label\nabc,x\n");
        Assert.Equal(2, Kit.Cli.Program.Main(new[] { "score", bundle, data, "--out", Path.Combine(_dir, "o.csv") }));
        Assert.False(File.Exists(Path.Combine(_dir, "o.csv")));
    }
}
