using System.Buffers;
using System.Text;
using System.Text.Unicode;

namespace Kit.Data;

/// <summary>
/// Turns a file's bytes into text, refusing what would silently corrupt rows later: an empty file, NUL bytes
/// (usually a UTF-16 or binary file given by mistake) and invalid UTF-8. A UTF-8 byte order mark is dropped.
/// Line breaks are LF, CRLF or a lone CR, counted the same way the row readers count them.
/// </summary>
internal static class SourceText
{
    static readonly byte[] Bom = [0xEF, 0xBB, 0xBF];

    public static string Decode(string source, byte[] bytes)
    {
        var span = bytes.AsSpan();
        if (span.StartsWith(Bom)) span = span[Bom.Length..];
        if (span.IsEmpty) throw new DataError(source, 1, bytes.Length == 0 ? "empty file" : "empty file (only a byte order mark)");

        int nul = span.IndexOf((byte)0);
        int limit = nul < 0 ? span.Length : nul;
        var status = Utf8.IsValid(span[..limit]) ? OperationStatus.Done : OperationStatus.InvalidData;
        if (status != OperationStatus.Done)
        {
            int bad = FirstInvalid(span[..limit]);
            var (line, column) = Locate(span[..bad]);
            throw new DataError(source, line, column, $"invalid UTF-8 (byte 0x{span[bad]:X2} at file offset {bad + (bytes.Length - span.Length)})");
        }
        if (nul >= 0)
        {
            var (line, column) = Locate(span[..nul]);
            throw new DataError(source, line, column, "NUL byte in file (is it UTF-16 or binary? expected UTF-8 text)");
        }
        return Encoding.UTF8.GetString(span);
    }

    static int FirstInvalid(ReadOnlySpan<byte> bytes)
    {
        var chars = ArrayPool<char>.Shared.Rent(4096);
        try
        {
            int offset = 0;
            while (true)
            {
                var status = Utf8.ToUtf16(bytes[offset..], chars, out int read, out _, replaceInvalidSequences: false, isFinalBlock: true);
                offset += read;
                if (status == OperationStatus.InvalidData || status == OperationStatus.NeedMoreData) return offset;
                if (status == OperationStatus.Done) return bytes.Length;
            }
        }
        finally { ArrayPool<char>.Shared.Return(chars); }
    }

    /// <summary>1-based line and character column just after <paramref name="prefix"/> (which is valid UTF-8).</summary>
    internal static (int Line, int Column) Locate(ReadOnlySpan<byte> prefix)
    {
        int line = 1, lineStart = 0;
        for (int i = 0; i < prefix.Length; i++)
        {
            byte b = prefix[i];
            if (b == (byte)'\n' || (b == (byte)'\r' && (i + 1 >= prefix.Length || prefix[i + 1] != (byte)'\n')))
            {
                line++;
                lineStart = i + 1;
            }
        }
        return (line, Encoding.UTF8.GetCharCount(prefix[lineStart..]) + 1);
    }
}
