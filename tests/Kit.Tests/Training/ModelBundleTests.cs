using System.Buffers.Binary;
using Kit.Data;
using Kit.Training;

namespace Kit.Tests.Training;

[Collection(EngineRandomCollection.Name)]
public sealed class ModelBundleTests : IDisposable
{
    readonly string _dir = Path.Combine(Path.GetTempPath(), "kit-bundle-" + Guid.NewGuid().ToString("N"));

    public ModelBundleTests() => Directory.CreateDirectory(_dir);

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    static readonly string[] TrainingTexts = { "abcab", "cabba", "bbbca", "aacbb", "cccab", "abccc" };

    static ModelBundle Bundle(double? temperature = 1.7)
    {
        var tokenizer = new CharacterTokenizer();
        var vocabulary = Vocabulary.Build(TrainingTexts.Select(tokenizer.Split));
        Kit.Native.Engine.EnsureLoaded();
        TorchSharp.torch.manual_seed(4);
        var model = new Kit.Models.ClassifierConfig(vocabulary.Count, 3, EmbeddingSize: 6, HiddenSize: 5).Build();
        return new ModelBundle
        {
            Model = model, Tokenizer = TokenizerSpec.Of(tokenizer), Vocabulary = vocabulary,
            Labels = new LabelMap(new[] { "gamma", "alpha", "beta" }), MaxLength = 4, Truncation = TruncationPolicy.KeepTail,
            Temperature = temperature, TrainingSeed = 42,
        };
    }

    string Saved(ModelBundle b)
    {
        string path = Path.Combine(_dir, "m.kitmodel");
        b.Save(path);
        return path;
    }

    [Fact]
    public void Round_trip_keeps_weights_metadata_and_scores()
    {
        var original = Bundle();
        var loaded = ModelBundle.Load(Saved(original));
        TinySets.AssertSameWeights(original.Model, loaded.Model);
        Assert.Equal(original.Config, loaded.Config);
        Assert.Equal(original.Vocabulary.Tokens, loaded.Vocabulary.Tokens);
        Assert.Equal(new[] { "alpha", "beta", "gamma" }, loaded.Labels.Names);
        Assert.Equal((4, TruncationPolicy.KeepTail, 1.7, 42UL), (loaded.MaxLength, loaded.Truncation, loaded.Temperature, loaded.TrainingSeed));
        Assert.Equal(original.Tokenizer, loaded.Tokenizer);
        var texts = new[] { "abc", "ccccbbba", "b" };
        Assert.Equal(TextScorer.Score(original, texts).Probabilities, TextScorer.Score(loaded, texts).Probabilities);
        // The bytes depend only on the content.
        Assert.Equal(original.ToBytes(), loaded.ToBytes());
    }

    [Fact]
    public void An_uncalibrated_bundle_keeps_a_null_temperature()
    {
        var loaded = ModelBundle.Load(Saved(Bundle(temperature: null)));
        Assert.Null(loaded.Temperature);
        Assert.Equal(2.5, loaded.WithTemperature(2.5).Temperature);
    }

    [Fact]
    public void A_flipped_byte_is_refused_by_the_checksum()
    {
        string path = Saved(Bundle());
        var bytes = File.ReadAllBytes(path);
        bytes[bytes.Length / 2] ^= 0x10;
        File.WriteAllBytes(path, bytes);
        var e = Assert.Throws<BundleError>(() => ModelBundle.Load(path));
        Assert.Equal($"{path}: checksum mismatch: the file is corrupted (SHA-256 of its content does not match the stored one)", e.Message);
    }

    [Fact]
    public void A_truncated_file_is_refused()
    {
        string path = Saved(Bundle());
        var bytes = File.ReadAllBytes(path);
        File.WriteAllBytes(path, bytes[..(bytes.Length - 100)]);
        var e = Assert.Throws<BundleError>(() => ModelBundle.Load(path));
        Assert.StartsWith($"{path}: truncated: the header declares {bytes.Length} bytes but the file has {bytes.Length - 100}", e.Message);
        File.WriteAllBytes(path, bytes[..10]);
        Assert.Contains("truncated or not a kit model bundle", Assert.Throws<BundleError>(() => ModelBundle.Load(path)).Message);
    }

    [Fact]
    public void Foreign_files_and_other_versions_are_refused()
    {
        string path = Path.Combine(_dir, "data.csv");
        File.WriteAllText(path, "text,label\nabc,alpha\nthis is not a model at all,beta\n");
        Assert.Equal($"{path}: not a kit model bundle (expected the bytes 'KITMODEL' at the start)",
            Assert.Throws<BundleError>(() => ModelBundle.Load(path)).Message);

        var bytes = Bundle().ToBytes();
        BinaryPrimitives.WriteUInt32LittleEndian(bytes.AsSpan(8), 7);
        File.WriteAllBytes(path, bytes);
        Assert.Contains("format version 7 is not supported", Assert.Throws<BundleError>(() => ModelBundle.Load(path)).Message);
    }

    [Fact]
    public void A_checkpoint_is_not_taken_for_a_bundle()
    {
        var options = new TrainingOptions { Epochs = 1, BatchSize = 64, CheckpointDirectory = _dir };
        Trainer.Fit(TinySets.Model(), TinySets.Make(64, 1), null, options);
        var e = Assert.Throws<BundleError>(() => ModelBundle.Load(Trainer.CheckpointPath(_dir)));
        Assert.Contains("this is a kit training checkpoint, not a kit model bundle", e.Message);
    }

    [Fact]
    public void Scoring_flags_rows_it_cannot_read_and_applies_the_temperature()
    {
        var b = Bundle(temperature: 2.0);
        var scores = TextScorer.Score(b, new[] { "abca", "xyz", "", "zzab", "abcabcabc" });
        Assert.Equal(new[] { ScoreFlag.None, ScoreFlag.AllUnknown, ScoreFlag.Empty, ScoreFlag.None, ScoreFlag.None }, scores.Flags);
        Assert.Equal(new[] { -1, -1 }, new[] { scores.Predicted[1], scores.Predicted[2] });
        Assert.Null(scores.Probabilities[1]);
        Assert.Null(scores.Probabilities[2]);
        Assert.Equal(new[] { false, false, false, false, true }, scores.Truncated);
        foreach (int i in new[] { 0, 3, 4 })
        {
            var p = scores.Probabilities[i]!;
            Assert.Equal(1.0, p.Sum(), 12);
            Assert.Equal(Array.IndexOf(p, p.Max()), scores.Predicted[i]);
        }
        // T = 2 halves every logit: the tempered probabilities are the square roots of the plain ones, renormalised.
        var plain = TextScorer.Score(b.WithTemperature(null), new[] { "abca" }).Probabilities[0]!;
        var root = plain.Select(Math.Sqrt).ToArray();
        var expected = root.Select(r => r / root.Sum()).ToArray();
        for (int k = 0; k < 3; k++) Assert.Equal(expected[k], scores.Probabilities[0]![k], 6);
    }
}
