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

    /// <summary>The bundle with a profile counted on demo rows 600..899 (standing in for a validation part).</summary>
    public static ModelBundle WithProfile(ModelBundle bundle)
    {
        var table = Hostnames.Value;
        var rows = table.Texts.Skip(600).Take(300).ToArray();
        var tokenizer = bundle.Tokenizer.Create();
        var (set, _) = Encoder.Encode(rows, new int[rows.Length], tokenizer, bundle.Vocabulary, bundle.MaxLength, bundle.Truncation);
        var scores = TextScorer.Score(bundle, rows);
        var profile = TrainingProfile.From(bundle.MaxLength, rows.Select(t => tokenizer.Split(t).Count).ToArray(), set.Tokens.LongLength,
            set.Tokens.LongCount(id => id == Vocabulary.UnknownId), bundle.Labels.Names,
            table.Labels.Take(600).Select(l => bundle.Labels[l]).ToArray(), scores.Probabilities.Where(p => p is not null).Select(p => p!).ToArray());
        return new ModelBundle
        {
            Model = bundle.Model, Tokenizer = bundle.Tokenizer, Vocabulary = bundle.Vocabulary, Labels = bundle.Labels, MaxLength = bundle.MaxLength,
            Truncation = bundle.Truncation, Temperature = bundle.Temperature, TrainingSeed = bundle.TrainingSeed, Profile = profile,
        };
    }

    /// <summary>A CSV of demo rows (text, label) for the CLI to score.</summary>
    public static string RowsCsv(string dir, int skip, int take)
    {
        var table = Hostnames.Value;
        string path = Path.Combine(dir, $"rows-{skip}-{take}.csv");
        File.WriteAllLines(path, new[] { "text,label" }.Concat(Enumerable.Range(skip, take).Select(i => $"{table.Texts[i]},{table.Labels[i]}")));
        return path;
    }

    public static string TempDir()
    {
        string dir = Path.Combine(Path.GetTempPath(), "kit-onnx-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        return dir;
    }
}
