using Kit.Data;
using Kit.Models;
using Kit.Scoring;
using Kit.Tests.Experiments;
using Kit.Training;

namespace Kit.Tests.Onnx;

/// <summary>Kit.Scoring carries its own tokenizers; on every row of both demo files they must give the kit's token ids.</summary>
[Collection(global::Kit.Tests.Training.EngineRandomCollection.Name)]
public sealed class TokenIdTests : IDisposable
{
    readonly string _dir = OnnxSamples.TempDir();

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    public static TheoryData<string, string, bool, TruncationPolicy> Cases() => new()
    {
        { "hostnames.csv", TokenizerSpec.Character, false, TruncationPolicy.HeadAndTail },
        { "hostnames.csv", TokenizerSpec.Character, true, TruncationPolicy.KeepTail },
        { "hostnames.csv", TokenizerSpec.Byte, false, TruncationPolicy.KeepHead },
        { "maintenance-notes.csv", TokenizerSpec.Word, true, TruncationPolicy.HeadAndTail },
        { "maintenance-notes.csv", TokenizerSpec.Word, false, TruncationPolicy.KeepTail },
        { "maintenance-notes.csv", TokenizerSpec.Character, true, TruncationPolicy.KeepHead },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Ids_equal_the_kits_on_the_demo_data(string file, string kind, bool caseOption, TruncationPolicy truncation)
    {
        var table = TableReader.Read(Path.Combine(KitCli.RepoRoot(), "data-demo", file), new ColumnSpec("text", "label"));
        var spec = new TokenizerSpec(kind, FoldCase: kind == TokenizerSpec.Character && caseOption, LowerCase: kind == TokenizerSpec.Word && caseOption);
        var tokenizer = spec.Create();
        var vocabulary = kind == TokenizerSpec.Byte ? ByteTokenizer.FixedVocabulary()
            : Vocabulary.Build(table.Texts.Take(table.Count / 2).Select(tokenizer.Split), minCount: 2);
        int maxLength = 12;
        var (expected, _) = Encoder.Encode(table.Texts, new int[table.Count], tokenizer, vocabulary, maxLength, truncation);
        // Extra rows the demo lacks: accents (NFC), combining marks, CR LF, emoji, case.
        var extra = new[] { "Ｃafé-02.EXAMPLE", "e\u0301tat\r\nline", "pump 3 — ok 👍🏽", "" };
        var (extraExpected, _) = Encoder.Encode(extra, new int[extra.Length], tokenizer, vocabulary, maxLength, truncation);

        Kit.Native.Engine.EnsureLoaded();
        var model = new ClassifierConfig(vocabulary.Count, table.LabelMap().Count, EmbeddingSize: 4, HiddenSize: 4).Build();
        var bundle = new ModelBundle
        {
            Model = model, Tokenizer = spec, Vocabulary = vocabulary, Labels = table.LabelMap(), MaxLength = maxLength, Truncation = truncation,
        };
        string path = Path.Combine(_dir, "ids.onnx");
        OnnxExport.Write(bundle, path);
        using var scorer = ScoringModel.Load(path);
        for (int i = 0; i < table.Count; i++)
            Assert.True(expected[i].SequenceEqual(scorer.Encode(table.Texts[i])), $"{file} row {i}: '{table.Texts[i]}'");
        for (int i = 0; i < extra.Length; i++)
            Assert.True(extraExpected[i].SequenceEqual(scorer.Encode(extra[i])), $"extra row '{extra[i]}'");
        // The unknown id is exercised too (the byte vocabulary is closed, so it never has one).
        if (kind != TokenizerSpec.Byte) Assert.Contains(Vocabulary.UnknownId, extraExpected.Tokens);
    }
}
