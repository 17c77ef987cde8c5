using Microsoft.ML.OnnxRuntime;
using Microsoft.ML.OnnxRuntime.Tensors;

namespace Kit.Scoring;

/// <summary>
/// A classifier exported by the kit, scored on ONNX Runtime: texts in, label probabilities out. Load it once and
/// share it; <see cref="Score(IReadOnlyList{string}, int)"/> is safe to call from several threads (ONNX Runtime
/// sessions allow concurrent runs).
/// </summary>
public sealed class ScoringModel : IDisposable
{
    const string Tokens = "tokens", Lengths = "lengths", Logits = "logits", Probabilities = "probabilities";
    static readonly string[] OutputNames = { Logits, Probabilities };

    readonly InferenceSession _session;
    readonly TokenSplitter _splitter;
    readonly Dictionary<string, int> _ids;

    public ScoringManifest Manifest { get; }
    public string ModelPath { get; }
    public IReadOnlyList<string> Labels => Manifest.Labels;
    public int MaxLength => Manifest.MaxLength;

    ScoringModel(string path, InferenceSession session, ScoringManifest manifest, string manifestSource)
    {
        ModelPath = path;
        _session = session;
        Manifest = manifest;
        _splitter = TokenSplitter.For(manifest.TokenizerKind, manifest.FoldCase, manifest.LowerCase, manifestSource);
        _ids = new Dictionary<string, int>(manifest.Vocabulary.Count, StringComparer.Ordinal);
        for (int i = 2; i < manifest.Vocabulary.Count; i++) _ids[manifest.Vocabulary[i]] = i;
    }

    /// <summary>
    /// Loads <paramref name="onnxPath"/>. The side-car is read from <paramref name="sidecarPath"/>, else from
    /// "<paramref name="onnxPath"/>.json" when that exists, else from the copy inside the graph's metadata.
    /// Throws <see cref="ScoringModelError"/> naming the file and problem for anything it cannot use.
    /// </summary>
    public static ScoringModel Load(string onnxPath, string? sidecarPath = null, int threads = 0)
    {
        if (!File.Exists(onnxPath)) throw new ScoringModelError(onnxPath, "file not found");
        if (sidecarPath is not null && !File.Exists(sidecarPath)) throw new ScoringModelError(sidecarPath, "side-car file not found");
        var options = new SessionOptions();
        if (threads > 0) options.IntraOpNumThreads = threads;
        InferenceSession session;
        try
        {
            session = new InferenceSession(onnxPath, options);
        }
        catch (OnnxRuntimeException e)
        {
            throw new ScoringModelError(onnxPath, $"ONNX Runtime cannot load it as a model: {FirstLine(e.Message)}", e);
        }
        finally
        {
            options.Dispose();
        }
        try
        {
            var metadata = session.ModelMetadata.CustomMetadataMap;
            metadata.TryGetValue(ScoringManifest.ModelIdKey, out var graphId);
            string? sidecar = sidecarPath ?? (File.Exists(ScoringManifest.SidecarPath(onnxPath)) ? ScoringManifest.SidecarPath(onnxPath) : null);
            ScoringManifest manifest;
            if (sidecar is not null)
            {
                manifest = ScoringManifest.FromJson(File.ReadAllText(sidecar), sidecar);
                if (graphId is null)
                    throw new ScoringModelError(sidecar, $"does not match {onnxPath}: the graph carries no kit model id, so it was not exported with this side-car");
                if (graphId != manifest.ModelId)
                    throw new ScoringModelError(sidecar, $"does not match {onnxPath}: side-car model id {Short(manifest.ModelId)}, graph model id {Short(graphId)}");
            }
            else if (metadata.TryGetValue(ScoringManifest.SidecarKey, out var embedded))
                manifest = ScoringManifest.FromJson(embedded, onnxPath + " (embedded side-car)");
            else
                throw new ScoringModelError(onnxPath, $"not a kit export: no side-car ({Path.GetFileName(ScoringManifest.SidecarPath(onnxPath))}) and no kit metadata in the graph");
            CheckGraph(session, manifest, onnxPath, sidecar ?? onnxPath);
            return new ScoringModel(onnxPath, session, manifest, sidecar ?? onnxPath);
        }
        catch
        {
            session.Dispose();
            throw;
        }
    }

    static void CheckGraph(InferenceSession session, ScoringManifest manifest, string onnxPath, string manifestSource)
    {
        foreach (var name in new[] { Tokens, Lengths })
        {
            if (!session.InputMetadata.TryGetValue(name, out var input))
                throw new ScoringModelError(onnxPath, $"the graph has no '{name}' input");
            if (input.ElementDataType != TensorElementType.Int64)
                throw new ScoringModelError(onnxPath, $"input '{name}' is {input.ElementDataType}, expected int64");
        }
        foreach (var name in OutputNames)
        {
            if (!session.OutputMetadata.TryGetValue(name, out var output))
                throw new ScoringModelError(onnxPath, $"the graph has no '{name}' output");
            int classes = output.Dimensions.Length == 2 ? output.Dimensions[1] : -1;
            if (classes != manifest.Labels.Count)
                throw new ScoringModelError(manifestSource, $"does not match the graph: {manifest.Labels.Count} labels, but output '{name}' has {classes} classes");
        }
        if (session.ModelMetadata.CustomMetadataMap.TryGetValue("kit.vocabulary_size", out var size) && size != manifest.Vocabulary.Count.ToString(System.Globalization.CultureInfo.InvariantCulture))
            throw new ScoringModelError(manifestSource, $"does not match the graph: vocabulary of {manifest.Vocabulary.Count} tokens, graph embeds {size}");
    }

    static string Short(string id) => id.Length > 12 ? id[..12] : id;
    static string FirstLine(string s) => s.Split('\n')[0].Trim();

    /// <summary>Token ids of one text as the exporting run encoded it (cut to <see cref="MaxLength"/> by the policy).</summary>
    public int[] Encode(string text) => Encode(text, out _, out _);

    int[] Encode(string text, out int raw, out int unknown)
    {
        var pieces = _splitter.Split(text);
        raw = pieces.Count;
        int keep = Math.Min(raw, MaxLength);
        int head = Manifest.Truncation switch { "KeepHead" => keep, "KeepTail" => 0, _ => (keep + 1) / 2 };
        var ids = new int[keep];
        unknown = 0;
        for (int t = 0; t < keep; t++)
        {
            int source = t < head ? t : raw - (keep - t);
            ids[t] = _ids.TryGetValue(pieces[source], out int id) ? id : 1;
            if (ids[t] == 1) unknown++;
        }
        return ids;
    }

    public TextScore Score(string text) => Score(new[] { text })[0];

    /// <summary>Scores texts; rows are grouped by length into batches of up to <paramref name="batchSize"/>, and results come back in input order.</summary>
    public TextScore[] Score(IReadOnlyList<string> texts, int batchSize = 256)
    {
        var results = new TextScore[texts.Count];
        var encoded = new int[texts.Count][];
        var usable = new List<int>(texts.Count);
        var raws = new int[texts.Count];
        var unknowns = new int[texts.Count];
        for (int i = 0; i < texts.Count; i++)
        {
            encoded[i] = Encode(texts[i] ?? "", out raws[i], out unknowns[i]);
            if (encoded[i].Length > 0 && unknowns[i] < encoded[i].Length) usable.Add(i);
        }
        var probabilities = new float[texts.Count][];
        foreach (var (rows, p) in RunBatches(usable, encoded, batchSize))
            for (int k = 0; k < rows.Length; k++) probabilities[rows[k]] = p[k];
        for (int i = 0; i < texts.Count; i++)
        {
            var ids = encoded[i];
            var flag = ids.Length == 0 ? RowFlag.Empty : unknowns[i] == ids.Length ? RowFlag.AllUnknown : RowFlag.None;
            var p = probabilities[i];
            int best = p is null ? -1 : Array.IndexOf(p, p.Max());
            results[i] = new TextScore(best >= 0 ? Labels[best] : null, best, p, flag, ids.Length, raws[i], unknowns[i], raws[i] > MaxLength);
        }
        return results;
    }

    IEnumerable<(int[] Rows, float[][] Probabilities)> RunBatches(List<int> usable, int[][] encoded, int batchSize)
    {
        var order = usable.OrderBy(i => encoded[i].Length).ToArray();
        for (int start = 0; start < order.Length; start += batchSize)
        {
            var rows = order[start..Math.Min(order.Length, start + batchSize)];
            yield return (rows, Run(rows.Select(r => encoded[r]).ToArray()).Probabilities);
        }
    }

    /// <summary>
    /// Runs the graph on rows of token ids (each 1..<see cref="MaxLength"/> ids, each id in the vocabulary) and
    /// returns logits and probabilities per row. Rows longer than the exported maximum are refused, not cut.
    /// </summary>
    public (float[][] Logits, float[][] Probabilities) Run(IReadOnlyList<int[]> rows)
    {
        if (rows.Count == 0) return (Array.Empty<float[]>(), Array.Empty<float[]>());
        int steps = 0;
        for (int r = 0; r < rows.Count; r++)
        {
            int n = rows[r].Length;
            if (n < 1) throw new ArgumentException($"row {r} has no tokens");
            if (n > MaxLength) throw new ArgumentException($"row {r} has {n} tokens, longer than the exported maximum length {MaxLength}");
            foreach (int id in rows[r])
                if ((uint)id >= (uint)Manifest.Vocabulary.Count)
                    throw new ArgumentException($"row {r} holds token id {id}, outside the vocabulary (0..{Manifest.Vocabulary.Count - 1})");
            steps = Math.Max(steps, n);
        }
        var tokens = new long[rows.Count * steps];
        var lengths = new long[rows.Count];
        for (int r = 0; r < rows.Count; r++)
        {
            lengths[r] = rows[r].Length;
            for (int t = 0; t < rows[r].Length; t++) tokens[r * steps + t] = rows[r][t];
        }
        using var tokenValue = OrtValue.CreateTensorValueFromMemory(tokens, new long[] { rows.Count, steps });
        using var lengthValue = OrtValue.CreateTensorValueFromMemory(lengths, new long[] { rows.Count });
        using var runOptions = new RunOptions();
        using var outputs = _session.Run(runOptions, new[] { Tokens, Lengths }, new[] { tokenValue, lengthValue }, OutputNames);
        int classes = Labels.Count;
        var logits = Rows(outputs[0].GetTensorDataAsSpan<float>(), rows.Count, classes);
        var probabilities = Rows(outputs[1].GetTensorDataAsSpan<float>(), rows.Count, classes);
        return (logits, probabilities);
    }

    static float[][] Rows(ReadOnlySpan<float> flat, int count, int width)
    {
        var result = new float[count][];
        for (int i = 0; i < count; i++) result[i] = flat.Slice(i * width, width).ToArray();
        return result;
    }

    public void Dispose() => _session.Dispose();
}
