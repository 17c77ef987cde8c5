using System.Buffers.Binary;
using System.Runtime.InteropServices;
using System.Text;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// Named tensors to bytes and back: count, then per tensor its name, element type, shape and little-endian data.
/// Our own layout (not the engine's) so the bytes depend only on the values, which makes "same seed, same
/// weights" checkable by comparing files.
/// </summary>
internal static class TensorArchive
{
    public static byte[] Write(IEnumerable<KeyValuePair<string, Tensor>> tensors)
    {
        using var ms = new MemoryStream();
        using var w = new BinaryWriter(ms, Encoding.UTF8);
        var list = tensors.ToList();
        w.Write(list.Count);
        foreach (var (name, tensor) in list)
        {
            using var t = tensor.detach().cpu().contiguous();
            w.Write(name);
            w.Write((byte)Code(t.dtype, name));
            w.Write((byte)t.dim());
            foreach (long d in t.shape) w.Write(d);
            switch (t.dtype)
            {
                case ScalarType.Float32: w.Write(MemoryMarshal.AsBytes<float>(t.data<float>().ToArray())); break;
                case ScalarType.Float64: w.Write(MemoryMarshal.AsBytes<double>(t.data<double>().ToArray())); break;
                default: w.Write(MemoryMarshal.AsBytes<long>(t.data<long>().ToArray())); break;
            }
        }
        w.Flush();
        if (!BitConverter.IsLittleEndian) throw new PlatformNotSupportedException("the archive layout assumes a little-endian machine");
        return ms.ToArray();
    }

    /// <summary>Reads an archive; tensors are new CPU tensors outside any dispose scope (the caller disposes them).</summary>
    public static Dictionary<string, Tensor> Read(byte[] bytes, string source, string section)
    {
        Kit.Native.Engine.EnsureLoaded();
        var result = new Dictionary<string, Tensor>(StringComparer.Ordinal);
        try
        {
            using var r = new BinaryReader(new MemoryStream(bytes), Encoding.UTF8);
            int count = r.ReadInt32();
            if (count < 0) throw new InvalidDataException($"negative tensor count {count}");
            for (int i = 0; i < count; i++)
            {
                string name = r.ReadString();
                var dtype = Type(r.ReadByte(), name);
                int rank = r.ReadByte();
                var shape = new long[rank];
                long n = 1;
                for (int d = 0; d < rank; d++)
                {
                    shape[d] = r.ReadInt64();
                    if (shape[d] < 0) throw new InvalidDataException($"tensor '{name}' has a negative dimension");
                    n *= shape[d];
                }
                int width = dtype == ScalarType.Float32 ? 4 : 8;
                var raw = r.ReadBytes(checked((int)(n * width)));
                if (raw.Length != n * width) throw new InvalidDataException($"tensor '{name}' is cut short");
                Tensor t = dtype switch
                {
                    ScalarType.Float32 => torch.tensor(MemoryMarshal.Cast<byte, float>(raw).ToArray(), shape),
                    ScalarType.Float64 => torch.tensor(MemoryMarshal.Cast<byte, double>(raw).ToArray(), shape),
                    _ => torch.tensor(MemoryMarshal.Cast<byte, long>(raw).ToArray(), shape),
                };
                result[name] = t.DetachFromDisposeScope();
            }
            if (r.BaseStream.Position != bytes.Length) throw new InvalidDataException($"{bytes.Length - r.BaseStream.Position} bytes left over");
        }
        catch (Exception e) when (e is EndOfStreamException or InvalidDataException or OverflowException or IOException)
        {
            foreach (var t in result.Values) t.Dispose();
            throw new BundleError(source, $"section '{section}' is malformed: {e.Message}", e);
        }
        return result;
    }

    /// <summary>Copies saved tensors into a module's state, refusing any missing, extra or mis-shaped entry.</summary>
    public static void LoadInto(nn.Module module, IReadOnlyDictionary<string, Tensor> saved, string source)
    {
        var state = module.state_dict();
        var missing = state.Keys.Where(k => !saved.ContainsKey(k)).ToList();
        var extra = saved.Keys.Where(k => !state.ContainsKey(k)).ToList();
        if (missing.Count > 0 || extra.Count > 0)
            throw new BundleError(source, $"weights do not fit the model config (missing: {string.Join(", ", missing.DefaultIfEmpty("none"))}; unexpected: {string.Join(", ", extra.DefaultIfEmpty("none"))})");
        using var noGrad = torch.no_grad();
        foreach (var (name, target) in state)
        {
            var value = saved[name];
            if (!target.shape.SequenceEqual(value.shape) || target.dtype != value.dtype)
                throw new BundleError(source, $"weight '{name}' is {value.dtype} [{string.Join(", ", value.shape)}], the model expects {target.dtype} [{string.Join(", ", target.shape)}]");
            target.copy_(value);
        }
    }

    static int Code(ScalarType t, string name) => t switch
    {
        ScalarType.Float32 => 1,
        ScalarType.Float64 => 2,
        ScalarType.Int64 => 3,
        _ => throw new NotSupportedException($"tensor '{name}' has element type {t}; archives hold float32, float64 and int64"),
    };

    static ScalarType Type(byte code, string name) => code switch
    {
        1 => ScalarType.Float32,
        2 => ScalarType.Float64,
        3 => ScalarType.Int64,
        _ => throw new InvalidDataException($"tensor '{name}' has unknown element type code {code}"),
    };
}
