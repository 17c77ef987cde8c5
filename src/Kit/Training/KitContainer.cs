using System.Buffers.Binary;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json.Nodes;

namespace Kit.Training;

/// <summary>
/// The file layout shared by model bundles and checkpoints:
/// <code>
/// magic (8 bytes) | format version (uint32 LE) | manifest length (uint32 LE) | payload length (uint64 LE)
/// | manifest (UTF-8 JSON) | payload (named sections back to back) | SHA-256 of every byte before it (32 bytes)
/// </code>
/// The manifest lists each section's name and length in payload order. Reading checks, in this order: magic,
/// size, version, declared lengths against the real size, checksum, then the manifest — so a truncated,
/// corrupted or foreign file is refused before anything in it is trusted.
/// </summary>
internal static class KitContainer
{
    public const int FormatVersion = 1;
    const int HeaderSize = 8 + 4 + 4 + 8;
    const int HashSize = 32;

    public static byte[] Write(string magic, JsonObject manifest, IReadOnlyList<(string Name, byte[] Bytes)> sections)
    {
        var list = new JsonArray();
        foreach (var (name, bytes) in sections) list.Add(new JsonObject { ["name"] = name, ["length"] = bytes.Length });
        manifest["sections"] = list;
        byte[] json = Encoding.UTF8.GetBytes(manifest.ToJsonString());
        long payload = sections.Sum(s => (long)s.Bytes.Length);
        var result = new byte[HeaderSize + json.Length + payload + HashSize];
        Encoding.ASCII.GetBytes(magic, result.AsSpan(0, 8));
        BinaryPrimitives.WriteUInt32LittleEndian(result.AsSpan(8), FormatVersion);
        BinaryPrimitives.WriteUInt32LittleEndian(result.AsSpan(12), (uint)json.Length);
        BinaryPrimitives.WriteUInt64LittleEndian(result.AsSpan(16), (ulong)payload);
        json.CopyTo(result, HeaderSize);
        long at = HeaderSize + json.Length;
        foreach (var (_, bytes) in sections)
        {
            bytes.CopyTo(result, at);
            at += bytes.Length;
        }
        SHA256.HashData(result.AsSpan(0, (int)at), result.AsSpan((int)at));
        return result;
    }

    public static byte[] ReadFile(string path)
    {
        try
        {
            return File.ReadAllBytes(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new BundleError(path, $"cannot read the file: {e.Message}", e);
        }
    }

    public static (JsonObject Manifest, Dictionary<string, byte[]> Sections) Read(byte[] file, string source, string magic, string what,
        IReadOnlyDictionary<string, string>? otherMagics = null)
    {
        string found = Encoding.ASCII.GetString(file, 0, Math.Min(8, file.Length));
        if (file.Length >= 8 && found != magic)
        {
            if (otherMagics is not null && otherMagics.TryGetValue(found, out var other))
                throw new BundleError(source, $"this is a {other}, not a {what}");
            throw new BundleError(source, $"not a {what} (expected the bytes '{magic}' at the start)");
        }
        if (file.Length < HeaderSize + HashSize)
            throw new BundleError(source, $"truncated or not a {what}: {file.Length} bytes, less than the {HeaderSize + HashSize}-byte minimum");
        uint version = BinaryPrimitives.ReadUInt32LittleEndian(file.AsSpan(8));
        if (version != FormatVersion)
            throw new BundleError(source, $"{what} format version {version} is not supported (this build reads version {FormatVersion})");
        long manifestLength = BinaryPrimitives.ReadUInt32LittleEndian(file.AsSpan(12));
        ulong payloadLength = BinaryPrimitives.ReadUInt64LittleEndian(file.AsSpan(16));
        ulong expected = (ulong)HeaderSize + (ulong)manifestLength + payloadLength + HashSize;
        if (payloadLength > (ulong)file.Length || expected != (ulong)file.Length)
            throw new BundleError(source, expected > (ulong)file.Length
                ? $"truncated: the header declares {expected} bytes but the file has {file.Length}"
                : $"{(ulong)file.Length - expected} unexpected bytes after the end the header declares ({expected} bytes)");
        int body = file.Length - HashSize;
        Span<byte> hash = stackalloc byte[HashSize];
        SHA256.HashData(file.AsSpan(0, body), hash);
        if (!hash.SequenceEqual(file.AsSpan(body)))
            throw new BundleError(source, "checksum mismatch: the file is corrupted (SHA-256 of its content does not match the stored one)");

        JsonObject manifest;
        try
        {
            manifest = JsonNode.Parse(file.AsMemory(HeaderSize, (int)manifestLength).Span) as JsonObject
                ?? throw new BundleError(source, "manifest is not a JSON object");
        }
        catch (System.Text.Json.JsonException e)
        {
            throw new BundleError(source, $"manifest is not valid JSON: {e.Message}", e);
        }
        var sections = new Dictionary<string, byte[]>(StringComparer.Ordinal);
        long at = HeaderSize + manifestLength;
        foreach (var node in manifest["sections"] as JsonArray ?? throw new BundleError(source, "manifest lists no sections"))
        {
            string name = (string?)node?["name"] ?? throw new BundleError(source, "a manifest section has no name");
            long length = (long?)node?["length"] ?? -1;
            if (length < 0 || at + length > body) throw new BundleError(source, $"section '{name}' runs past the payload");
            sections[name] = file.AsSpan((int)at, (int)length).ToArray();
            at += length;
        }
        if (at != body) throw new BundleError(source, $"sections cover {at - HeaderSize - manifestLength} of {payloadLength} payload bytes");
        return (manifest, sections);
    }
}
