using Kit.Data;
using Kit.Models;
using Kit.Tests.Experiments;
using Kit.Training;
using TorchSharp;

namespace Kit.Tests.Onnx;

/// <summary>Small untrained bundles over real rows of data-demo, with weights scaled up so the outputs are far from uniform.</summary>
internal static class OnnxSamples
{
    static readonly Lazy<LabelledTable> Hostnames = new(() => TableReader.Read(KitCli.DemoHostnames, new ColumnSpec("text", "label")));

    /// <summary>Rows 0..count of the demo hostnames (real demo rows, mixed lengths).</summary>
    public static IReadOnlyList<string> Texts(int count = 240) => Hostnames.Value.Texts.Take(count).ToArray();

    public static ModelBundle Bundle(ClassifierConfig shape, int maxLength = 24, double? temperature = 1.3, ulong seed = 7,
        TruncationPolicy truncation = TruncationPolicy.HeadAndTail, double scale = 3.0)
    {
        var table = Hostnames.Value;
        var tokenizer = new CharacterTokenizer();
        var vocabulary = Vocabulary.Build(table.Texts.Take(600).Select(tokenizer.Split));
        var labels = table.LabelMap();
        Kit.Native.Engine.EnsureLoaded();
        torch.manual_seed((long)seed);
        var model = (shape with { VocabularySize = vocabulary.Count, Classes = labels.Count }).Build();
        using (torch.no_grad())
            if (scale != 1.0) foreach (var p in model.parameters()) p.mul_(scale);
        model.eval();
        return new ModelBundle
        {
            Model = model, Tokenizer = TokenizerSpec.Of(tokenizer), Vocabulary = vocabulary, Labels = labels,
            MaxLength = maxLength, Truncation = truncation, Temperature = temperature, TrainingSeed = seed,
        };
    }

    public static string TempDir()
    {
        string dir = Path.Combine(Path.GetTempPath(), "kit-onnx-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        return dir;
    }
}
