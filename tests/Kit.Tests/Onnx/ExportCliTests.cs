using System.Globalization;
using System.Text.Json.Nodes;
using Kit.Models;
using Kit.Tests.Experiments;

namespace Kit.Tests.Onnx;

/// <summary>`kit export` then `kit score` on the .onnx file against `kit score` on the bundle, and the bad-input paths.</summary>
[Collection(global::Kit.Tests.Training.EngineRandomCollection.Name)]
public sealed class ExportCliTests : IDisposable
{
    readonly string _dir = OnnxSamples.TempDir();

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    string SavedBundle(CellKind cell, string name = "model.kitmodel", ulong seed = 7, int maxLength = 24, ClassifierConfig? shape = null)
    {
        shape ??= new ClassifierConfig(2, 2, cell, EmbeddingSize: 8, HiddenSize: 6, Layers: 2, Bidirectional: true, Pooling: PoolingKind.Attention);
        var bundle = OnnxSamples.WithProfile(OnnxSamples.Bundle(shape, seed: seed, maxLength: maxLength));
        string path = Path.Combine(_dir, name);
        bundle.Save(path);
        return path;
    }

    static (int Code, string Out, string Err) RunKit(params string[] args) => KitCli.Run(args);

    static List<string[]> ReadCsv(string path) => File.ReadAllLines(path).Select(l => l.Split(',')).ToList();

    [Theory]
    [InlineData(CellKind.Gru)]
    [InlineData(CellKind.Lstm)]
    [InlineData(CellKind.Rnn)]
    public void Scoring_the_export_equals_scoring_the_bundle(CellKind cell) => ExportThenScore(SavedBundle(cell));

    [Theory]
    [InlineData(EncoderKind.Convolution)]
    [InlineData(EncoderKind.Transformer)]
    public void Scoring_the_export_of_the_other_encoders_equals_scoring_the_bundle(EncoderKind encoder)
    {
        var shape = new ClassifierConfig(2, 2, EmbeddingSize: 8, HiddenSize: 8, Layers: 2, Pooling: PoolingKind.Mean, Encoder: encoder, Heads: 2,
            Positions: PositionKind.Learned, MaxPositions: 24);
        ExportThenScore(SavedBundle(CellKind.Gru, shape: shape));
    }

    void ExportThenScore(string bundle)
    {
        string onnx = Path.Combine(_dir, "model.onnx");
        string rows = OnnxSamples.RowsCsv(_dir, 900, 300);
        var export = RunKit("export", bundle, "--onnx", onnx);
        Assert.True(export.Code == 0, export.Err);
        Assert.True(File.Exists(onnx + ".json"));
        var viaBundle = RunKit("score", bundle, rows, "--label", "label", "--out", Path.Combine(_dir, "bundle.csv"));
        var viaOnnx = RunKit("score", onnx, rows, "--label", "label", "--out", Path.Combine(_dir, "onnx.csv"));
        Assert.True(viaBundle.Code == 0, viaBundle.Err);
        Assert.True(viaOnnx.Code == 0, viaOnnx.Err);
        var a = ReadCsv(Path.Combine(_dir, "bundle.csv"));
        var b = ReadCsv(Path.Combine(_dir, "onnx.csv"));
        Assert.Equal(a.Count, b.Count);
        Assert.Equal(a[0], b[0]);
        int firstProbability = Array.FindIndex(a[0], h => h.StartsWith("p_", StringComparison.Ordinal));
        double worst = 0;
        for (int r = 1; r < a.Count; r++)
        {
            Assert.Equal(a[r][..firstProbability], b[r][..firstProbability]);   // line, label, predicted, flag, tokens, truncated
            for (int k = firstProbability; k < a[r].Length; k++)
                if (a[r][k] != "") worst = Math.Max(worst, Math.Abs(double.Parse(a[r][k], CultureInfo.InvariantCulture) - double.Parse(b[r][k], CultureInfo.InvariantCulture)));
        }
        Assert.True(worst <= 1e-5, $"largest probability difference {worst:E2}");
        // Both print the drift summary and write it beside the scores, with the same verdicts.
        Assert.Contains("drift check:", viaBundle.Out);
        Assert.Contains("drift check:", viaOnnx.Out);
        var driftA = JsonNode.Parse(File.ReadAllText(Path.Combine(_dir, "bundle.drift.json")))!;
        var driftB = JsonNode.Parse(File.ReadAllText(Path.Combine(_dir, "onnx.drift.json")))!;
        Assert.Equal(driftA["checks"]!.AsArray().Select(c => (string?)c!["level"]), driftB["checks"]!.AsArray().Select(c => (string?)c!["level"]));
    }

    [Fact]
    public void A_file_that_is_not_onnx_is_a_clear_error()
    {
        string fake = Path.Combine(_dir, "notes.onnx");
        File.WriteAllText(fake, "this is a text file, not a model");
        var r = RunKit("score", fake, OnnxSamples.RowsCsv(_dir, 0, 5), "--out", Path.Combine(_dir, "o.csv"));
        Assert.Equal(2, r.Code);
        Assert.StartsWith($"{fake}: ONNX Runtime cannot load it as a model", r.Err.Trim());
        Assert.False(File.Exists(Path.Combine(_dir, "o.csv")));
    }

    [Fact]
    public void A_side_car_from_another_export_is_refused()
    {
        string first = Path.Combine(_dir, "first.onnx"), second = Path.Combine(_dir, "second.onnx");
        Assert.Equal(0, RunKit("export", SavedBundle(CellKind.Gru, "a.kitmodel", seed: 1), "--onnx", first).Code);
        Assert.Equal(0, RunKit("export", SavedBundle(CellKind.Gru, "b.kitmodel", seed: 2), "--onnx", second).Code);
        var r = RunKit("score", first, OnnxSamples.RowsCsv(_dir, 0, 5), "--sidecar", second + ".json", "--out", Path.Combine(_dir, "o.csv"));
        Assert.Equal(2, r.Code);
        Assert.Contains($"{second}.json: does not match {first}: side-car model id", r.Err);
    }

    [Fact]
    public void An_opset_onnx_runtime_does_not_know_is_a_clear_error()
    {
        string onnx = Path.Combine(_dir, "future.onnx");
        Assert.Equal(0, RunKit("export", SavedBundle(CellKind.Gru), "--onnx", onnx, "--opset", "999").Code);
        var r = RunKit("score", onnx, OnnxSamples.RowsCsv(_dir, 0, 5), "--out", Path.Combine(_dir, "o.csv"));
        Assert.Equal(2, r.Code);
        Assert.StartsWith($"{onnx}: ONNX Runtime cannot load it as a model", r.Err.Trim());
        Assert.Contains("999", r.Err);
        var tooOld = RunKit("export", SavedBundle(CellKind.Gru), "--onnx", onnx, "--opset", "11");
        Assert.Equal(2, tooOld.Code);
        Assert.Contains("opset 17 or later", tooOld.Err);
    }

    [Fact]
    public void Rows_longer_than_the_exported_maximum_are_cut_and_reported()
    {
        string onnx = Path.Combine(_dir, "short.onnx");
        Assert.Equal(0, RunKit("export", SavedBundle(CellKind.Gru, maxLength: 6), "--onnx", onnx).Code);
        string rows = OnnxSamples.RowsCsv(_dir, 0, 20);
        var r = RunKit("score", onnx, rows, "--out", Path.Combine(_dir, "o.csv"));
        Assert.Equal(0, r.Code);
        var csv = ReadCsv(Path.Combine(_dir, "o.csv"));
        int truncated = Array.IndexOf(csv[0], "truncated");
        int cut = csv.Skip(1).Count(row => row[truncated] == "true");
        Assert.True(cut > 0);
        Assert.Contains($"{rows}: {cut} row(s) longer than the model's maximum of 6 tokens were cut (HeadAndTail)", r.Err);
        // The library's id-level entry refuses such a row rather than cutting it silently.
        using var model = global::Kit.Scoring.ScoringModel.Load(onnx);
        var e = Assert.Throws<ArgumentException>(() => model.Run(new[] { new[] { 2, 3, 4, 5, 6, 7, 8 } }));
        Assert.Contains("longer than the exported maximum length 6", e.Message);
    }

    [Fact]
    public void Kit_train_keeps_a_training_profile_that_export_carries_to_the_side_car()
    {
        string rows = OnnxSamples.RowsCsv(_dir, 0, 400);
        string outDir = Path.Combine(_dir, "train");
        var train = RunKit("train", rows, "--epochs", "1", "--embed", "8", "--hidden", "8", "--max-length", "32", "--threads", "1", "--out", outDir);
        Assert.True(train.Code == 0, train.Err);
        var bundle = global::Kit.Training.ModelBundle.Load(Path.Combine(outDir, "model.kitmodel"));
        var profile = Assert.IsType<global::Kit.Training.TrainingProfile>(bundle.Profile);
        Assert.True(profile.Rows > 0);
        Assert.Equal(profile.Rows, profile.LengthCounts.Sum());
        Assert.Equal(profile.Rows, profile.ConfidenceCounts.Sum());
        Assert.Equal(1.0, profile.ClassPrior.Sum(), 9);
        Assert.Equal(bundle.Labels.Names, profile.Labels);
        string onnx = Path.Combine(_dir, "trained.onnx");
        Assert.Equal(0, RunKit("export", Path.Combine(outDir, "model.kitmodel"), "--onnx", onnx).Code);
        var sidecar = JsonNode.Parse(File.ReadAllText(onnx + ".json"))!;
        Assert.Equal(profile.ToJson(), sidecar["profile"]!.ToJsonString());
    }
}
