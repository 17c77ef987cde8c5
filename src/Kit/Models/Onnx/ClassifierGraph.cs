using TorchSharp;
using static Kit.Models.Onnx.OnnxFields;
using static TorchSharp.torch;

namespace Kit.Models.Onnx;

/// <summary>
/// A trained <see cref="SequenceClassifier"/> as an ONNX graph (opset 17): inputs <c>tokens</c> int64 [batch, steps]
/// (right-padded with id 0) and <c>lengths</c> int64 [batch]; outputs <c>logits</c> and <c>probabilities</c>
/// (softmax of logits / temperature) float [batch, classes]. Batch and steps are dynamic.
///
/// The recurrent layers map onto the ONNX GRU / LSTM / RNN operators (ONNX Operators.md, opset 14 versions),
/// with sequence_lens so each row runs over its valid steps only, as the engine's packed run does: the backward
/// direction starts at each row's own last token. Gate blocks are reordered from the engine's layout (GRU r,z,n;
/// LSTM i,f,g,o) to ONNX's (GRU z,r,h; LSTM i,o,f,c), and the engine's GRU applies the reset gate after the
/// recurrent matrix product, which is ONNX's linear_before_reset = 1. Pooling uses the same padding mask as
/// <see cref="SequencePooling"/>. Dropout is absent: an exported model is in evaluation mode. The convolutional
/// and Transformer encoders are built from MatMul, Slice, LayerNormalization and Softmax nodes that repeat the
/// engine's arithmetic step by step (see <see cref="Convolution"/> and <see cref="Transformer"/>).
/// </summary>
public static class ClassifierGraph
{
    public const int Opset = 17;
    public const string TokensInput = "tokens", LengthsInput = "lengths", LogitsOutput = "logits", ProbabilitiesOutput = "probabilities";

    /// <summary>The ModelProto bytes. <paramref name="metadata"/> goes into the model's metadata_props.</summary>
    public static byte[] Build(SequenceClassifier model, double temperature, IReadOnlyList<KeyValuePair<string, string>> metadata,
        string producerVersion = "0.1.0", int opset = Opset, int positionRows = 0)
    {
        Kit.Native.Engine.EnsureLoaded();
        if (!(temperature > 0 && double.IsFinite(temperature))) throw new ArgumentOutOfRangeException(nameof(temperature), temperature, "temperature must be positive");
        var config = model.Config;
        var weights = Weights(model);
        var g = new OnnxGraph();
        g.Input(TokensInput, Int64Type, "batch", "steps");
        g.Input(LengthsInput, Int64Type, "batch");

        var embedding = g.Constant("embedding", weights["embedding.weight"].Data, config.VocabularySize, config.EmbeddingSize);
        var embedded = g.Node("Gather", new[] { embedding, TokensInput }, OnnxAttribute.Of("axis", 0L));          // [B, T, E]
        // Built on first use, so a recurrent graph with last-state pooling carries no unused mask nodes.
        Masks? built = null;
        Masks masks() => built ??= new Masks(g);
        string steps, yLast = "";
        switch (config.Encoder)
        {
            case EncoderKind.Recurrent: (steps, yLast) = Recurrent(g, config, weights, embedded); break;
            case EncoderKind.Convolution: steps = Convolution(g, config, weights, embedded, masks()); break;
            case EncoderKind.Transformer: steps = Transformer(g, config, weights, embedded, masks(), positionRows); break;
            default: throw new NotSupportedException($"ONNX export does not cover encoder '{config.Encoder}'");
        }

        var pooled = Pool(g, config, weights, steps, yLast, masks);
        string logitsRaw = Head(g, config, weights, pooled);
        g.NodeNamed("Identity", new[] { logitsRaw }, new[] { LogitsOutput });
        var scaled = g.Node("Div", new[] { LogitsOutput, g.Scalar("temperature", (float)temperature) });
        g.NodeNamed("Softmax", new[] { scaled }, new[] { ProbabilitiesOutput }, OnnxAttribute.Of("axis", 1L));
        g.Output(LogitsOutput, FloatType, "batch", (long)config.Classes);
        g.Output(ProbabilitiesOutput, FloatType, "batch", (long)config.Classes);
        // A module the graph does not know (a newer encoder, a norm layer) would otherwise be left out silently.
        var unused = weights.Unused();
        if (unused.Count > 0)
            throw new NotSupportedException($"ONNX export does not cover this model: weights {string.Join(", ", unused.Take(4))} have no place in the exported graph");
        return g.ToModel("kit_sequence_classifier", opset, metadata, "kit", producerVersion);
    }

    /// <summary>Recurrent layers on ONNX GRU / LSTM / RNN: per-step outputs [B, T, D·H] and the final states Y_h [D, B, H].</summary>
    static (string Steps, string Last) Recurrent(OnnxGraph g, ClassifierConfig config, IReadOnlyDictionary<string, Weight> weights, string embedded)
    {
        int h = config.HiddenSize, directions = config.Directions, gates = config.GateCount;
        var x = g.Node("Transpose", new[] { embedded }, OnnxAttribute.Of("perm", new long[] { 1, 0, 2 }));       // [T, B, E]
        var sequenceLengths = g.Node("Cast", new[] { LengthsInput }, OnnxAttribute.Of("to", (long)Int32Type));
        var mergeShape = g.Constant("merge_directions", new long[] { 0, 0, -1 }, 3);

        string y = "", yLast = "";
        for (int layer = 0; layer < config.Layers; layer++)
        {
            long input = layer == 0 ? config.EmbeddingSize : config.PooledSize;
            var (w, r, b) = LayerWeights(weights, config, layer);
            var wName = g.Constant($"W_l{layer}", w, directions, gates * h, input);
            var rName = g.Constant($"R_l{layer}", r, directions, gates * h, h);
            var bName = g.Constant($"B_l{layer}", b, directions, 2 * gates * h);
            var attributes = new List<OnnxAttribute>
            {
                OnnxAttribute.Of("hidden_size", (long)h),
                OnnxAttribute.Of("direction", config.Bidirectional ? "bidirectional" : "forward"),
            };
            if (config.Cell == CellKind.Gru) attributes.Add(OnnxAttribute.Of("linear_before_reset", 1L));
            string op = config.Cell switch { CellKind.Gru => "GRU", CellKind.Lstm => "LSTM", CellKind.Rnn => "RNN", _ => throw Unsupported(config) };
            var outputs = g.Node(op, new[] { x, wName, rName, bName, sequenceLengths }, 2, attributes.ToArray());
            y = outputs[0];                                                                                          // [T, D, B, H]
            yLast = outputs[1];                                                                                      // [D, B, H]
            if (layer < config.Layers - 1)
                x = g.Node("Reshape", new[] { g.Node("Transpose", new[] { y }, OnnxAttribute.Of("perm", new long[] { 0, 2, 1, 3 })), mergeShape });
        }
        // Per-step outputs [B, T, D·H], forward half first, as the engine lays them out.
        var steps = g.Node("Reshape", new[] { g.Node("Transpose", new[] { y }, OnnxAttribute.Of("perm", new long[] { 2, 0, 1, 3 })), mergeShape });

        return (steps, yLast);
    }

    /// <summary>
    /// <see cref="ConvolutionEncoder"/> as the engine computes it: pad steps zeroed, w − 1 zero steps appended, the
    /// window of steps t … t + w − 1 side by side [B, T, w·E] (w slices of the padded sequence), one affine map per
    /// width, ReLU; the widths' filters concatenated in order.
    /// </summary>
    static string Convolution(OnnxGraph g, ClassifierConfig config, IReadOnlyDictionary<string, Weight> weights, string embedded, Masks m)
    {
        var x = g.Node("Where", new[] { m.Valid3, embedded, g.Scalar("zero_embedded", 0f) });                     // [B, T, E]
        var features = new List<string>();
        var widths = config.KernelWidths;
        for (int i = 0; i < widths.Count; i++)
        {
            int w = widths[i];
            string padded = w == 1 ? x : g.Node("Pad", new[] { x, g.Constant($"pad_w{w}", new long[] { 0, 0, 0, 0, w - 1, 0 }, 6) });
            string windows;
            if (w == 1) windows = x;
            else
            {
                // Slice j is steps j … j + T − 1 of the padded sequence (T + w − 1 long): end −(w − 1 − j), or the end itself.
                var parts = new string[w];
                for (int j = 0; j < w; j++)
                {
                    long end = j == w - 1 ? long.MaxValue : -(w - 1 - j);
                    parts[j] = g.Node("Slice", new[] { padded, g.Constant($"start_{i}_{j}", new long[] { j }, 1), g.Constant($"end_{i}_{j}", new long[] { end }, 1), m.Axis1 });
                }
                windows = g.Node("Concat", parts, OnnxAttribute.Of("axis", 2L));                                    // [B, T, w·E]
            }
            features.Add(g.Node("Relu", new[] { Affine(g, weights, windows, $"encoder.convolutions.{i}") }));
        }
        return features.Count == 1 ? features[0] : g.Node("Concat", features.ToArray(), OnnxAttribute.Of("axis", 2L));
    }

    /// <summary>
    /// <see cref="TransformerEncoder"/>: input map, positions (the learned table or the sinusoids as a constant, first
    /// T rows), pre-LN blocks of multi-head self-attention (pad keys get −∞ before the softmax, as in the engine) and a
    /// ReLU feed-forward layer, each in a residual connection, a final LayerNormalization, pad steps zeroed. Dropout is
    /// the identity at inference and has no node.
    /// </summary>
    static string Transformer(OnnxGraph g, ClassifierConfig config, IReadOnlyDictionary<string, Weight> weights, string embedded, Masks m, int positionRows)
    {
        int d = config.HiddenSize, heads = config.Heads, dk = d / heads;
        var x = Affine(g, weights, embedded, "encoder.input");                                                    // [B, T, D]
        string table;
        if (config.Positions == PositionKind.Learned)
        {
            var learned = weights["encoder.positions.weight"];
            // The engine refuses a batch longer than its table; the graph's Slice would cut silently instead.
            if (positionRows > config.MaxPositions)
                throw new NotSupportedException($"rows may hold {positionRows} tokens but the learned position table holds {config.MaxPositions}");
            table = g.Constant("positions", learned.Data, learned.Shape);
        }
        else
        {
            int rows = Math.Max(positionRows, config.MaxPositions);
            using var sinusoids = TransformerEncoder.Sinusoids(rows, d);
            table = g.Constant("sinusoids", sinusoids.data<float>().ToArray(), rows, d);
        }
        var first = g.Node("Slice", new[] { table, g.Constant("positions_start", new long[] { 0 }, 1), m.StepCount1, m.Axis0 });   // [T, D]
        x = g.Node("Add", new[] { x, first });
        var headShape = g.Constant("head_shape", new long[] { 0, 0, heads, dk }, 4);
        var mergeShape = g.Constant("merge_heads", new long[] { 0, 0, d }, 3);
        var keyValid = g.Node("Unsqueeze", new[] { m.Valid, g.Constant("axes_key", new long[] { 1, 2 }, 2) });    // [B, 1, 1, T]
        var scale = g.Scalar("sqrt_dk", (float)Math.Sqrt(dk));
        var minusInf = g.Scalar("minus_inf_keys", float.NegativeInfinity);
        for (int layer = 0; layer < config.Layers; layer++)
        {
            string p = $"encoder.blocks.{layer}.";
            string Heads(string y, long[] perm) => g.Node("Transpose", new[] { g.Node("Reshape", new[] { y, headShape }) }, OnnxAttribute.Of("perm", perm));
            var normed = Norm(g, weights, x, p + "attention_norm");
            var q = Heads(Affine(g, weights, normed, p + "attention.query"), new long[] { 0, 2, 1, 3 });         // [B, h, T, dk]
            var kT = Heads(Affine(g, weights, normed, p + "attention.key"), new long[] { 0, 2, 3, 1 });          // [B, h, dk, T]
            var v = Heads(Affine(g, weights, normed, p + "attention.value"), new long[] { 0, 2, 1, 3 });
            var scores = g.Node("Div", new[] { g.Node("MatMul", new[] { q, kT }), scale });                      // [B, h, T, T]
            var attention = g.Node("Softmax", new[] { g.Node("Where", new[] { keyValid, scores, minusInf }) }, OnnxAttribute.Of("axis", -1L));
            var mixed = g.Node("Reshape", new[] { g.Node("Transpose", new[] { g.Node("MatMul", new[] { attention, v }) }, OnnxAttribute.Of("perm", new long[] { 0, 2, 1, 3 })), mergeShape });
            var y = g.Node("Add", new[] { x, Affine(g, weights, mixed, p + "attention.output") });
            var inner = g.Node("Relu", new[] { Affine(g, weights, Norm(g, weights, y, p + "feed_norm"), p + "feed_in") });
            x = g.Node("Add", new[] { y, Affine(g, weights, inner, p + "feed_out") });
        }
        x = Norm(g, weights, x, "encoder.final_norm");
        return g.Node("Where", new[] { m.Valid3, x, g.Scalar("zero_steps", 0f) });
    }

    /// <summary>A linear layer on the last axis of a [B, T, in] tensor: MatMul by Wᵀ, then Add b.</summary>
    static string Affine(OnnxGraph g, IReadOnlyDictionary<string, Weight> weights, string input, string prefix)
    {
        var w = weights[prefix + ".weight"];
        var wT = g.Constant(prefix.Replace('.', '_') + "_wt", Transpose(w), w.Shape[1], w.Shape[0]);
        var b = g.Constant(prefix.Replace('.', '_') + "_b", weights[prefix + ".bias"].Data, w.Shape[0]);
        return g.Node("Add", new[] { g.Node("MatMul", new[] { input, wT }), b });
    }

    /// <summary>LayerNormalization over the last axis with the engine's ε = 1e−5 (TorchSharp nn.LayerNorm default).</summary>
    static string Norm(OnnxGraph g, IReadOnlyDictionary<string, Weight> weights, string input, string prefix)
    {
        var scale = weights[prefix + ".weight"];
        var scaleName = g.Constant(prefix.Replace('.', '_') + "_scale", scale.Data, scale.Shape);
        var biasName = g.Constant(prefix.Replace('.', '_') + "_bias", weights[prefix + ".bias"].Data, scale.Shape);
        return g.Node("LayerNormalization", new[] { input, scaleName, biasName }, OnnxAttribute.Of("axis", -1L), OnnxAttribute.Of("epsilon", 1e-5f));
    }

    static Exception Unsupported(ClassifierConfig config) =>
        new NotSupportedException($"ONNX export does not cover recurrent cell '{config.Cell}'");

    /// <summary>The padding masks from <c>lengths</c>, built once: valid[b, t] = t &lt; length[b].</summary>
    sealed class Masks
    {
        public readonly string StepCount, StepCount1, Range, Axis0, Axis1, Axis2, LengthColumn, Valid, Valid3;

        public Masks(OnnxGraph g)
        {
            var shape = g.Node("Shape", new[] { TokensInput });
            StepCount = g.Node("Gather", new[] { shape, g.Scalar("one", 1L) }, OnnxAttribute.Of("axis", 0L));
            Range = g.Node("Range", new[] { g.Scalar("zero_i", 0L), StepCount, g.Scalar("one_i", 1L) });          // [T]
            Axis0 = g.Constant("axis0", new long[] { 0 }, 1);
            Axis1 = g.Constant("axis1", new long[] { 1 }, 1);
            Axis2 = g.Constant("axis2", new long[] { 2 }, 1);
            StepCount1 = g.Node("Unsqueeze", new[] { StepCount, Axis0 });                                           // [1]
            LengthColumn = g.Node("Unsqueeze", new[] { LengthsInput, Axis1 });                                       // [B, 1]
            Valid = g.Node("Less", new[] { g.Node("Unsqueeze", new[] { Range, Axis0 }), LengthColumn });           // [B, T]
            Valid3 = g.Node("Unsqueeze", new[] { Valid, Axis2 });                                                    // [B, T, 1]
        }
    }

    static string Pool(OnnxGraph g, ClassifierConfig config, IReadOnlyDictionary<string, Weight> weights, string steps, string yLast, Func<Masks> masks)
    {
        if (config.Pooling == PoolingKind.Last && config.Encoder == EncoderKind.Recurrent)
        {
            // Y_h holds each direction's state at its own end: step length−1 forward, step 0 backward.
            var perRow = g.Node("Transpose", new[] { yLast }, OnnxAttribute.Of("perm", new long[] { 1, 0, 2 }));      // [B, D, H]
            return g.Node("Reshape", new[] { perRow, g.Constant("flatten_directions", new long[] { 0, -1 }, 2) });
        }
        var m = masks();
        string mask = m.Valid, mask3 = m.Valid3, axis1 = m.Axis1, axis2 = m.Axis2, lengthColumn = m.LengthColumn;
        var clean = g.Node("Where", new[] { mask3, steps, g.Scalar("zero_f", 0f) });
        var keep = OnnxAttribute.Of("keepdims", 0L);
        switch (config.Pooling)
        {
            case PoolingKind.Last:
                // One direction: the output at step length−1 (a one-hot pick, so the sum adds only zeros to it).
                var lastStep = g.Node("Sub", new[] { lengthColumn, g.Scalar("one_last", 1L) });
                var isLast = g.Node("Unsqueeze", new[] { g.Node("Equal", new[] { g.Node("Unsqueeze", new[] { m.Range, m.Axis0 }), lastStep }), axis2 });
                return g.Node("ReduceSum", new[] { g.Node("Where", new[] { isLast, clean, g.Scalar("zero_last", 0f) }), axis1 }, keep);
            case PoolingKind.Mean:
                var sum = g.Node("ReduceSum", new[] { clean, axis1 }, keep);
                return g.Node("Div", new[] { sum, g.Node("Cast", new[] { lengthColumn }, OnnxAttribute.Of("to", (long)FloatType)) });
            case PoolingKind.Max:
                var floor = g.Node("Where", new[] { mask3, steps, g.Scalar("minus_inf", float.NegativeInfinity) });
                // ReduceMax takes its axes as an attribute until opset 18.
                return g.Node("ReduceMax", new[] { floor }, OnnxAttribute.Of("axes", new long[] { 1 }), keep);
            case PoolingKind.Attention:
                var proj = weights["pooling.attention_proj.weight"];
                var projT = g.Constant("attention_proj_t", Transpose(proj), proj.Shape[1], proj.Shape[0]);
                var projB = g.Constant("attention_proj_b", weights["pooling.attention_proj.bias"].Data, proj.Shape[0]);
                var score = weights["pooling.attention_score.weight"];
                var scoreT = g.Constant("attention_score_t", score.Data, score.Shape[1], 1);
                var hidden = g.Node("Tanh", new[] { g.Node("Add", new[] { g.Node("MatMul", new[] { clean, projT }), projB }) });
                var scores = g.Node("Squeeze", new[] { g.Node("MatMul", new[] { hidden, scoreT }), axis2 });           // [B, T]
                var masked = g.Node("Where", new[] { mask, scores, g.Scalar("minus_inf_a", float.NegativeInfinity) });
                var alpha = g.Node("Softmax", new[] { masked }, OnnxAttribute.Of("axis", 1L));
                var weighted = g.Node("Mul", new[] { g.Node("Unsqueeze", new[] { alpha, axis2 }), clean });
                return g.Node("ReduceSum", new[] { weighted, axis1 }, keep);
            default:
                throw new NotSupportedException($"ONNX export does not cover pooling '{config.Pooling}'");
        }
    }

    static string Head(OnnxGraph g, ClassifierConfig config, IReadOnlyDictionary<string, Weight> weights, string pooled)
    {
        string Linear(string input, string prefix)
        {
            var w = weights[prefix + ".weight"];
            var wName = g.Constant(prefix.Replace('.', '_') + "_w", w.Data, w.Shape);
            var bName = g.Constant(prefix.Replace('.', '_') + "_b", weights[prefix + ".bias"].Data, w.Shape[0]);
            return g.Node("Gemm", new[] { input, wName, bName }, OnnxAttribute.Of("transB", 1L));
        }
        return config.Head switch
        {
            HeadKind.Linear => Linear(pooled, "head.linear"),
            HeadKind.Mlp => Linear(g.Node("Relu", new[] { Linear(pooled, "head.hidden") }), "head.output"),
            _ => throw new NotSupportedException($"ONNX export does not cover head '{config.Head}'"),
        };
    }

    /// <summary>One layer's W [D, G·H, in], R [D, G·H, H] and B [D, 2·G·H] (Wb then Rb), gate blocks in ONNX order.</summary>
    static (float[] W, float[] R, float[] B) LayerWeights(IReadOnlyDictionary<string, Weight> weights, ClassifierConfig config, int layer)
    {
        var w = new List<float>();
        var r = new List<float>();
        var b = new List<float>();
        int[] order = config.Cell switch
        {
            CellKind.Gru => new[] { 1, 0, 2 },     // engine r,z,n → ONNX z,r,h
            CellKind.Lstm => new[] { 0, 3, 1, 2 }, // engine i,f,g,o → ONNX i,o,f,c
            _ => new[] { 0 },
        };
        for (int direction = 0; direction < config.Directions; direction++)
        {
            string prefix = CellPrefix(config, layer, direction);
            w.AddRange(Reorder(weights[prefix + "weight_ih_" + Suffix(config, layer, direction)], order));
            r.AddRange(Reorder(weights[prefix + "weight_hh_" + Suffix(config, layer, direction)], order));
            b.AddRange(Reorder(weights[prefix + "bias_ih_" + Suffix(config, layer, direction)], order));
            b.AddRange(Reorder(weights[prefix + "bias_hh_" + Suffix(config, layer, direction)], order));
        }
        return (w.ToArray(), r.ToArray(), b.ToArray());
    }

    // A packed or unidirectional stack is one fused engine cell; an unpacked bidirectional stack is one cell per layer and direction.
    static bool Split(ClassifierConfig config) => !config.Packed && config.Bidirectional;

    static string CellPrefix(ClassifierConfig config, int layer, int direction) =>
        Split(config) ? $"encoder.cells.{2 * layer + direction}." : "encoder.cells.0.";

    static string Suffix(ClassifierConfig config, int layer, int direction) =>
        Split(config) ? "l0" : direction == 0 ? $"l{layer}" : $"l{layer}_reverse";

    static IEnumerable<float> Reorder(Weight weight, int[] order)
    {
        int block = weight.Data.Length / order.Length;
        foreach (int g in order)
            for (int i = 0; i < block; i++) yield return weight.Data[g * block + i];
    }

    static float[] Transpose(Weight w)
    {
        long rows = w.Shape[0], cols = w.Shape[1];
        var t = new float[w.Data.Length];
        for (long i = 0; i < rows; i++)
            for (long j = 0; j < cols; j++) t[j * rows + i] = w.Data[i * cols + j];
        return t;
    }

    sealed record Weight(float[] Data, long[] Shape);

    /// <summary>The model's weights by state-dict name, remembering which ones the graph has read.</summary>
    sealed class WeightSet : IReadOnlyDictionary<string, Weight>
    {
        readonly Dictionary<string, Weight> _all = new(StringComparer.Ordinal);
        readonly HashSet<string> _read = new(StringComparer.Ordinal);

        public WeightSet(SequenceClassifier model)
        {
            foreach (var (name, tensor) in model.state_dict())
            {
                using var cpu = tensor.detach().cpu().to(ScalarType.Float32).contiguous();
                _all[name] = new Weight(cpu.data<float>().ToArray(), cpu.shape);
            }
        }

        public Weight this[string key]
        {
            get
            {
                if (!_all.TryGetValue(key, out var w)) throw new NotSupportedException($"ONNX export expected a weight '{key}' that this model does not have");
                _read.Add(key);
                return w;
            }
        }

        public IReadOnlyList<string> Unused() => _all.Keys.Where(k => !_read.Contains(k)).OrderBy(k => k, StringComparer.Ordinal).ToArray();
        public IEnumerable<string> Keys => _all.Keys;
        public IEnumerable<Weight> Values => _all.Values;
        public int Count => _all.Count;
        public bool ContainsKey(string key) => _all.ContainsKey(key);
        public bool TryGetValue(string key, [System.Diagnostics.CodeAnalysis.MaybeNullWhen(false)] out Weight value) => _all.TryGetValue(key, out value);
        public IEnumerator<KeyValuePair<string, Weight>> GetEnumerator() => _all.GetEnumerator();
        System.Collections.IEnumerator System.Collections.IEnumerable.GetEnumerator() => GetEnumerator();
    }

    static WeightSet Weights(SequenceClassifier model) => new(model);
}
