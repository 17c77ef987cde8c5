using Kit.Models;
using Kit.Models.Onnx;
using TorchSharp;

namespace Kit.Tests.Onnx;

/// <summary>The exporter refuses a model it cannot express rather than leaving part of it out.</summary>
[Collection(global::Kit.Tests.Training.EngineRandomCollection.Name)]
public sealed class ExportGuardTests
{
    [Theory]
    [InlineData(EncoderKind.Recurrent)]
    [InlineData(EncoderKind.Convolution)]
    [InlineData(EncoderKind.Transformer)]
    public void A_weight_the_graph_has_no_place_for_is_refused(EncoderKind encoder)
    {
        Kit.Native.Engine.EnsureLoaded();
        var model = new ClassifierConfig(10, 3, EmbeddingSize: 4, HiddenSize: 4, Encoder: encoder, Heads: 2).Build();
        // Without the extra weight the same model exports, so the refusal below is the guard's doing.
        Assert.NotEmpty(ClassifierGraph.Build(model, 1.0, Array.Empty<KeyValuePair<string, string>>()));
        // Stands in for a module added to the classifier later (a new encoder, a norm layer) that the exporter does not know.
        model.register_parameter("later_module_scale", new TorchSharp.Modules.Parameter(torch.ones(4)));
        var e = Assert.Throws<NotSupportedException>(() => ClassifierGraph.Build(model, 1.0, Array.Empty<KeyValuePair<string, string>>()));
        Assert.Contains("later_module_scale", e.Message);
    }

    [Fact]
    public void A_bundle_with_a_user_function_tokenizer_cannot_travel()
    {
        var bundle = OnnxSamples.Bundle(new ClassifierConfig(2, 2, EmbeddingSize: 4, HiddenSize: 4));
        var delegated = new global::Kit.Training.ModelBundle
        {
            Model = bundle.Model, Tokenizer = new global::Kit.Data.TokenizerSpec(global::Kit.Data.TokenizerSpec.Delegate, Name: "mine"),
            Vocabulary = bundle.Vocabulary, Labels = bundle.Labels, MaxLength = bundle.MaxLength,
        };
        var e = Assert.Throws<NotSupportedException>(() => global::Kit.Training.OnnxExport.Build(delegated));
        Assert.Contains("user function", e.Message);
    }
}
