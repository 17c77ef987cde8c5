using static Kit.Models.Onnx.OnnxFields;

namespace Kit.Models.Onnx;

/// <summary>One node attribute: an int, a float, a string or a list of ints.</summary>
internal sealed record OnnxAttribute(string Name, long? Int = null, float? Float = null, string? Text = null, long[]? Ints = null)
{
    public static OnnxAttribute Of(string name, long value) => new(name, Int: value);
    public static OnnxAttribute Of(string name, float value) => new(name, Float: value);
    public static OnnxAttribute Of(string name, string value) => new(name, Text: value);
    public static OnnxAttribute Of(string name, long[] value) => new(name, Ints: value);

    public void WriteTo(ProtoWriter w)
    {
        w.String(AttrName, Name);
        if (Int is long i) w.Varint(AttrType, AttrTypeInt).Varint(AttrI, i);
        else if (Float is float f) w.Varint(AttrType, AttrTypeFloat).Float(AttrF, f);
        else if (Text is string s) w.Varint(AttrType, AttrTypeString).String(AttrS, s);
        else if (Ints is long[] list)
        {
            w.Varint(AttrType, AttrTypeInts);
            foreach (long v in list) w.Varint(AttrInts, v);
        }
        else throw new InvalidOperationException($"attribute '{Name}' has no value");
    }
}

/// <summary>
/// Builds an ONNX graph node by node (in topological order, as the format requires) and writes the ModelProto.
/// Values get unique names from a hint and a counter; constants become initializers.
/// </summary>
internal sealed class OnnxGraph
{
    readonly List<byte[]> _nodes = new(), _initializers = new(), _inputs = new(), _outputs = new();
    readonly HashSet<string> _names = new(StringComparer.Ordinal);
    int _counter;

    public string Fresh(string hint)
    {
        string name = hint;
        while (!_names.Add(name)) name = $"{hint}_{++_counter}";
        return name;
    }

    /// <summary>A float tensor constant (row-major).</summary>
    public string Constant(string hint, float[] data, params long[] dims)
    {
        CheckSize(data.Length, dims, hint);
        var raw = new byte[data.Length * 4];
        for (int i = 0; i < data.Length; i++) BitConverter.TryWriteBytes(raw.AsSpan(i * 4), data[i]);
        return Tensor(hint, FloatType, raw, dims);
    }

    public string Constant(string hint, long[] data, params long[] dims)
    {
        CheckSize(data.Length, dims, hint);
        var raw = new byte[data.Length * 8];
        for (int i = 0; i < data.Length; i++) BitConverter.TryWriteBytes(raw.AsSpan(i * 8), data[i]);
        return Tensor(hint, Int64Type, raw, dims);
    }

    public string Scalar(string hint, float value) => Constant(hint, new[] { value });
    public string Scalar(string hint, long value) => Constant(hint, new[] { value });

    string Tensor(string hint, int type, byte[] raw, long[] dims)
    {
        if (!BitConverter.IsLittleEndian) throw new PlatformNotSupportedException("ONNX raw_data is little-endian; this writer assumes a little-endian host");
        string name = Fresh(hint);
        var w = new ProtoWriter();
        foreach (long d in dims) w.Varint(TensorDims, d);
        w.Varint(TensorDataType, type).String(TensorName, name).Bytes(TensorRawData, raw);
        _initializers.Add(w.ToArray());
        return name;
    }

    static void CheckSize(int length, long[] dims, string hint)
    {
        long expected = dims.Aggregate(1L, (a, d) => a * d);
        if (expected != length) throw new ArgumentException($"constant '{hint}': {length} values for shape [{string.Join(", ", dims)}]");
    }

    /// <summary>A node with one output; returns the output's name.</summary>
    public string Node(string op, string[] inputs, params OnnxAttribute[] attributes) => Node(op, inputs, 1, attributes)[0];

    /// <summary>A node with several outputs (e.g. GRU's Y and Y_h).</summary>
    public string[] Node(string op, string[] inputs, int outputs, params OnnxAttribute[] attributes)
    {
        var names = Enumerable.Range(0, outputs).Select(i => Fresh($"{op.ToLowerInvariant()}{(outputs > 1 ? "_o" + i : "")}")).ToArray();
        NodeNamed(op, inputs, names, attributes);
        return names;
    }

    /// <summary>A node writing to given output names (graph outputs keep their public names).</summary>
    public void NodeNamed(string op, string[] inputs, string[] outputs, params OnnxAttribute[] attributes)
    {
        foreach (var o in outputs) _names.Add(o);
        var w = new ProtoWriter();
        foreach (var i in inputs) w.String(NodeInput, i);
        foreach (var o in outputs) w.String(NodeOutput, o);
        w.String(NodeName, $"n{_nodes.Count}_{op}").String(NodeOpType, op);
        foreach (var a in attributes) w.Message(NodeAttribute, a.WriteTo);
        _nodes.Add(w.ToArray());
    }

    /// <summary>A graph input or output: element type and dims, each a fixed size (long) or a symbolic name (string).</summary>
    public void Input(string name, int elementType, params object[] dims) { _names.Add(name); _inputs.Add(ValueInfo(name, elementType, dims)); }
    public void Output(string name, int elementType, params object[] dims) => _outputs.Add(ValueInfo(name, elementType, dims));

    static byte[] ValueInfo(string name, int elementType, object[] dims) => new ProtoWriter()
        .String(ValueInfoName, name)
        .Message(ValueInfoType, t => t.Message(TypeTensor, tensor => tensor
            .Varint(TypeTensorElemType, elementType)
            .Message(TypeTensorShape, shape =>
            {
                foreach (var d in dims)
                    shape.Message(ShapeDim, dim =>
                    {
                        if (d is string symbol) dim.String(DimParam, symbol);
                        else dim.Varint(DimValue, Convert.ToInt64(d));
                    });
            })))
        .ToArray();

    /// <summary>The whole ModelProto. IR version 8 is the one that goes with opset 17 (ONNX docs/Versioning.md table).</summary>
    public byte[] ToModel(string graphName, int opset, IReadOnlyList<KeyValuePair<string, string>> metadata, string producer, string producerVersion,
        long irVersion = 8)
    {
        var w = new ProtoWriter();
        w.Varint(ModelIrVersion, irVersion)
            .String(ModelProducerName, producer)
            .String(ModelProducerVersion, producerVersion)
            .Message(ModelGraph, g =>
            {
                foreach (var n in _nodes) g.Bytes(GraphNode, n);
                g.String(GraphName, graphName);
                foreach (var t in _initializers) g.Bytes(GraphInitializer, t);
                foreach (var i in _inputs) g.Bytes(GraphInput, i);
                foreach (var o in _outputs) g.Bytes(GraphOutput, o);
            })
            .Message(ModelOpsetImport, o => o.String(OpsetDomain, "").Varint(OpsetVersion, opset));
        foreach (var (key, value) in metadata)
            w.Message(ModelMetadataProps, e => e.String(EntryKey, key).String(EntryValue, value));
        return w.ToArray();
    }
}
