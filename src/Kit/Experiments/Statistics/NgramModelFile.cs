using System.Buffers.Binary;
using System.Text;
using System.Text.Json.Nodes;
using Kit.Common;
using Kit.Data;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// A fitted n-gram baseline in one file that `kit score` reads like a model bundle: tokenizer, label names, n-gram
/// scheme, the n-grams with their idf, and the classifier's numbers. Stored in the kit's container layout (magic
/// "KITNGRAM", checksummed; the bytes depend only on the content).
/// </summary>
public sealed class NgramModelFile
{
    public const string Magic = "KITNGRAM";
    public const string DefaultFileName = "baseline.kitngram";
    const string What = "kit n-gram baseline";

    public required NgramBaseline Baseline { get; init; }
    public required TokenizerSpec Tokenizer { get; init; }
    public required LabelMap Labels { get; init; }

    /// <summary>True when the file starts with this format's magic (so a caller can tell it from a neural bundle).</summary>
    public static bool IsOne(string path)
    {
        using var stream = File.OpenRead(path);
        var head = new byte[8];
        return stream.Read(head, 0, 8) == 8 && Encoding.ASCII.GetString(head) == Magic;
    }

    public byte[] ToBytes()
    {
        var b = Baseline;
        if (b.Classes != Labels.Count) throw new InvalidOperationException($"the baseline has {b.Classes} classes but the label map {Labels.Count}");
        var scheme = b.Features.Scheme;
        var manifest = new JsonObject
        {
            ["kind"] = "kit-ngram",
            ["classifier"] = b.Kind.ToString(),
            ["tokenizer"] = JsonNode.Parse(Tokenizer.ToJson()),
            ["labels"] = new JsonArray(Labels.Names.Select(n => (JsonNode?)JsonValue.Create(n)).ToArray()),
            ["scheme"] = new JsonObject
            {
                ["unit"] = scheme.Unit.ToString(), ["minN"] = scheme.MinN, ["maxN"] = scheme.MaxN,
                ["weighting"] = scheme.Weighting.ToString(), ["sublinearTf"] = scheme.SublinearTf,
            },
            ["features"] = b.Features.Count,
            ["smoothing"] = b.NaiveBayes?.Smoothing,
            ["l2"] = b.LogisticRegression?.L2,
        };
        var sections = new List<(string, byte[])>
        {
            ("ngrams", Strings(b.Features.Ngrams)),
            ("idf", Doubles(b.Features.Idf.ToArray())),
        };
        if (b.NaiveBayes is { } nb)
        {
            sections.Add(("priors", Doubles(nb.LogPriors.ToArray())));
            sections.Add(("weights", Doubles(nb.LogThetas.ToArray())));
        }
        else
        {
            var lr = b.LogisticRegression!;
            sections.Add(("priors", Doubles(lr.Intercepts.ToArray())));
            sections.Add(("weights", Doubles(lr.Weights.ToArray())));
        }
        return KitContainer.Write(Magic, manifest, sections);
    }

    public void Save(string path) => AtomicFile.WriteAllBytes(path, ToBytes());

    public static NgramModelFile Load(string path) => FromBytes(KitContainer.ReadFile(path), path);

    public static NgramModelFile FromBytes(byte[] bytes, string source)
    {
        var (m, sections) = KitContainer.Read(bytes, source, Magic, What,
            new Dictionary<string, string> { [ModelBundle.Magic] = "kit model bundle" });
        if ((string?)m["kind"] != "kit-ngram") throw new BundleError(source, "manifest kind is not 'kit-ngram'");
        try
        {
            var tokenizer = TokenizerSpec.FromJson(Need(m, "tokenizer", source).ToJsonString());
            var names = Need(m, "labels", source).AsArray().Select(n => (string?)n ?? throw new BundleError(source, "a label name is null")).ToArray();
            var labels = new LabelMap(names);
            if (!labels.Names.SequenceEqual(names, StringComparer.Ordinal))
                throw new BundleError(source, "label names are not distinct and in ordinal order, so class ids would not match the weights");
            var s = Need(m, "scheme", source);
            var scheme = new NgramScheme(Enum.Parse<NgramUnit>((string)s["unit"]!), (int)s["minN"]!, (int)s["maxN"]!,
                Enum.Parse<NgramWeighting>((string)s["weighting"]!), (bool)s["sublinearTf"]!).Validate();
            var ngrams = ReadStrings(Section(sections, "ngrams", source), source);
            var features = NgramFeatures.FromParts(scheme, ngrams, ReadDoubles(Section(sections, "idf", source)));
            var priors = ReadDoubles(Section(sections, "priors", source));
            var weights = ReadDoubles(Section(sections, "weights", source));
            var kind = Enum.Parse<BaselineKind>((string?)m["classifier"] ?? throw new BundleError(source, "manifest has no 'classifier'"));
            var baseline = kind == BaselineKind.NaiveBayes
                ? new NgramBaseline(features, NgramNaiveBayes.FromParts(labels.Count, features.Count, (double)m["smoothing"]!, priors, weights), null)
                : new NgramBaseline(features, null, NgramLogisticRegression.FromParts(labels.Count, features.Count, (double)m["l2"]!, weights, priors));
            return new NgramModelFile { Baseline = baseline, Tokenizer = tokenizer, Labels = labels };
        }
        catch (Exception e) when (e is FormatException or InvalidDataException or DataError or InvalidOperationException or ArgumentException or NullReferenceException)
        {
            throw new BundleError(source, $"manifest is malformed: {e.Message}", e);
        }
    }

    /// <summary>
    /// Scores raw texts: rows with no tokens are flagged Empty, rows with no n-gram seen in training AllUnknown
    /// (only the boundary mark: the model would only echo its class prior); the rest get probabilities. No truncation applies.
    /// </summary>
    public TextScores Score(IReadOnlyList<string> texts)
    {
        var tokenizer = Tokenizer.Create();
        var tokens = texts.Select(t => tokenizer.Split(t)).ToArray();
        var x = Baseline.Features.Transform(tokens);
        int n = texts.Count;
        var predicted = Enumerable.Repeat(-1, n).ToArray();
        var probabilities = new double[]?[n];
        var flags = new ScoreFlag[n];
        // The boundary mark alone is in every character row, so it says nothing about whether the text was seen.
        int mark = Baseline.Features.IndexOf(NgramFeatures.BoundaryMark);
        for (int i = 0; i < n; i++)
        {
            if (tokens[i].Count == 0) { flags[i] = ScoreFlag.Empty; continue; }
            var columns = x.ColumnsOf(i);
            if (columns.Length == 0 || (columns.Length == 1 && columns[0] == mark)) { flags[i] = ScoreFlag.AllUnknown; continue; }
            var p = Baseline.NaiveBayes is { } nb ? nb.Probabilities(x.ColumnsOf(i), x.ValuesOf(i)) : Baseline.LogisticRegression!.Probabilities(x.ColumnsOf(i), x.ValuesOf(i));
            probabilities[i] = p;
            predicted[i] = Array.IndexOf(p, p.Max());
        }
        return new TextScores(predicted, probabilities, flags, tokens.Select(t => t.Count).ToArray(), new bool[n]);
    }

    static JsonNode Need(JsonObject m, string key, string source) => m[key] ?? throw new BundleError(source, $"manifest has no '{key}'");

    static byte[] Section(Dictionary<string, byte[]> sections, string name, string source) =>
        sections.TryGetValue(name, out var bytes) ? bytes : throw new BundleError(source, $"no '{name}' section");

    static byte[] Doubles(double[] values)
    {
        var bytes = new byte[values.Length * 8];
        for (int i = 0; i < values.Length; i++) BinaryPrimitives.WriteDoubleLittleEndian(bytes.AsSpan(i * 8), values[i]);
        return bytes;
    }

    static double[] ReadDoubles(byte[] bytes)
    {
        if (bytes.Length % 8 != 0) throw new InvalidDataException($"a section of doubles has {bytes.Length} bytes, not a multiple of 8");
        var values = new double[bytes.Length / 8];
        for (int i = 0; i < values.Length; i++) values[i] = BinaryPrimitives.ReadDoubleLittleEndian(bytes.AsSpan(i * 8));
        return values;
    }

    /// <summary>Each string as its UTF-8 byte count (uint32 LE) then its bytes.</summary>
    static byte[] Strings(IReadOnlyList<string> strings)
    {
        using var stream = new MemoryStream();
        Span<byte> length = stackalloc byte[4];
        foreach (var s in strings)
        {
            var bytes = Encoding.UTF8.GetBytes(s);
            BinaryPrimitives.WriteUInt32LittleEndian(length, (uint)bytes.Length);
            stream.Write(length);
            stream.Write(bytes);
        }
        return stream.ToArray();
    }

    static string[] ReadStrings(byte[] bytes, string source)
    {
        var result = new List<string>();
        int at = 0;
        while (at < bytes.Length)
        {
            if (at + 4 > bytes.Length) throw new BundleError(source, "the n-gram section ends inside a length");
            int n = (int)BinaryPrimitives.ReadUInt32LittleEndian(bytes.AsSpan(at));
            at += 4;
            if (n < 0 || at + n > bytes.Length) throw new BundleError(source, "the n-gram section ends inside an n-gram");
            result.Add(Encoding.UTF8.GetString(bytes, at, n));
            at += n;
        }
        return result.ToArray();
    }
}
