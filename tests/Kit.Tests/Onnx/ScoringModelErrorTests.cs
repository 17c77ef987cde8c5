using System.Text.Json.Nodes;
using Kit.Models;
using Kit.Scoring;
using Kit.Training;

namespace Kit.Tests.Onnx;

/// <summary>Kit.Scoring refuses what it cannot use with an error naming the file and the problem.</summary>
[Collection(global::Kit.Tests.Training.EngineRandomCollection.Name)]
public sealed class ScoringModelErrorTests : IDisposable
{
    readonly string _dir = OnnxSamples.TempDir();
    readonly string _onnx;

    public ScoringModelErrorTests()
    {
        _onnx = Path.Combine(_dir, "m.onnx");
        OnnxExport.Write(OnnxSamples.Bundle(new ClassifierConfig(2, 2, EmbeddingSize: 4, HiddenSize: 4)), _onnx);
    }

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    ScoringModelError Refused(Action<JsonObject> edit)
    {
        var sidecar = JsonNode.Parse(File.ReadAllText(_onnx + ".json"))!.AsObject();
        edit(sidecar);
        File.WriteAllText(_onnx + ".json", sidecar.ToJsonString());
        var e = Assert.Throws<ScoringModelError>(() => ScoringModel.Load(_onnx));
        Assert.Equal(_onnx + ".json", e.File);
        return e;
    }

    [Fact]
    public void A_side_car_with_fewer_labels_than_the_graph_has_outputs()
    {
        var e = Refused(s => s["labels"]!.AsArray().RemoveAt(0));
        Assert.Matches(@"does not match the graph: \d+ labels, but output 'logits' has \d+ classes", e.Problem);
    }

    [Fact]
    public void A_side_car_with_another_vocabulary_size()
    {
        var e = Refused(s => s["vocabulary"]!.AsArray().Add("zz-extra"));
        Assert.Contains("does not match the graph: vocabulary of", e.Problem);
    }

    [Fact]
    public void A_side_car_that_is_not_json_or_not_ours()
    {
        string good = File.ReadAllText(_onnx + ".json");
        File.WriteAllText(_onnx + ".json", "{ \"format\": \"kit-onnx-sidecar\", ");
        Assert.StartsWith("the side-car is not valid JSON", Assert.Throws<ScoringModelError>(() => ScoringModel.Load(_onnx)).Problem);
        File.WriteAllText(_onnx + ".json", good);
        var e = Refused(s => s["format"] = "something-else");
        Assert.Equal("not a kit side-car (format is not 'kit-onnx-sidecar')", e.Problem);
    }

    [Fact]
    public void A_missing_model_file_and_an_unknown_tokenizer()
    {
        var missing = Assert.Throws<ScoringModelError>(() => ScoringModel.Load(Path.Combine(_dir, "none.onnx")));
        Assert.Equal("file not found", missing.Problem);
        var e = Refused(s => s["tokenizer"]!["kind"] = "sentencepiece");
        Assert.StartsWith("unknown tokenizer kind 'sentencepiece'", e.Problem);
    }

    [Fact]
    public void Without_a_side_car_file_the_copy_inside_the_graph_is_used()
    {
        File.Delete(_onnx + ".json");
        using var model = ScoringModel.Load(_onnx);
        Assert.Equal(7, model.Labels.Count);
        Assert.NotNull(model.Score("web-01.example").Label);
    }
}
