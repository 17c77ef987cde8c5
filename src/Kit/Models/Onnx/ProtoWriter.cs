using System.Text;

namespace Kit.Models.Onnx;

/// <summary>
/// The few protocol-buffer wire forms an ONNX file needs: varints (wire type 0), 32-bit floats (type 5) and
/// length-delimited bytes, strings and nested messages (type 2). Field numbers come from the caller; see
/// <see cref="OnnxFields"/>. Encoding rules: Protocol Buffers "Encoding" guide (varint, tag = field &lt;&lt; 3 | type).
/// </summary>
internal sealed class ProtoWriter
{
    readonly MemoryStream _buffer = new();

    public ProtoWriter Varint(int field, long value)
    {
        Tag(field, 0);
        Raw((ulong)value);
        return this;
    }

    public ProtoWriter Float(int field, float value)
    {
        Tag(field, 5);
        Span<byte> bytes = stackalloc byte[4];
        BitConverter.TryWriteBytes(bytes, value);
        if (!BitConverter.IsLittleEndian) bytes.Reverse();
        _buffer.Write(bytes);
        return this;
    }

    public ProtoWriter Bytes(int field, ReadOnlySpan<byte> value)
    {
        Tag(field, 2);
        Raw((ulong)value.Length);
        _buffer.Write(value);
        return this;
    }

    public ProtoWriter String(int field, string value) => Bytes(field, Encoding.UTF8.GetBytes(value));

    public ProtoWriter Message(int field, Action<ProtoWriter> body)
    {
        var inner = new ProtoWriter();
        body(inner);
        return Bytes(field, inner.ToArray());
    }

    public byte[] ToArray() => _buffer.ToArray();

    void Tag(int field, int wireType) => Raw((ulong)((field << 3) | wireType));

    void Raw(ulong value)
    {
        while (value >= 0x80)
        {
            _buffer.WriteByte((byte)(value | 0x80));
            value >>= 7;
        }
        _buffer.WriteByte((byte)value);
    }
}

/// <summary>
/// Field numbers of the ONNX ModelProto subset the exporter writes, as published in onnx/onnx.proto (ONNX
/// project, proto2 syntax; ModelProto, GraphProto, NodeProto, AttributeProto, TensorProto, ValueInfoProto,
/// TypeProto, TensorShapeProto, OperatorSetIdProto, StringStringEntryProto).
/// </summary>
internal static class OnnxFields
{
    public const int ModelIrVersion = 1, ModelProducerName = 2, ModelProducerVersion = 3, ModelDocString = 6, ModelGraph = 7,
        ModelOpsetImport = 8, ModelMetadataProps = 14;
    public const int OpsetDomain = 1, OpsetVersion = 2;
    public const int EntryKey = 1, EntryValue = 2;
    public const int GraphNode = 1, GraphName = 2, GraphInitializer = 5, GraphInput = 11, GraphOutput = 12;
    public const int NodeInput = 1, NodeOutput = 2, NodeName = 3, NodeOpType = 4, NodeAttribute = 5;
    public const int AttrName = 1, AttrF = 2, AttrI = 3, AttrS = 4, AttrInts = 8, AttrType = 20;
    public const int AttrTypeFloat = 1, AttrTypeInt = 2, AttrTypeString = 3, AttrTypeInts = 7;
    public const int TensorDims = 1, TensorDataType = 2, TensorName = 8, TensorRawData = 9;
    public const int ValueInfoName = 1, ValueInfoType = 2;
    public const int TypeTensor = 1, TypeTensorElemType = 1, TypeTensorShape = 2;
    public const int ShapeDim = 1, DimValue = 1, DimParam = 2;

    /// <summary>TensorProto.DataType values.</summary>
    public const int FloatType = 1, Int32Type = 6, Int64Type = 7, BoolType = 9;
}
