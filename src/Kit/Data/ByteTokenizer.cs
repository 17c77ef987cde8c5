using System.Text;

namespace Kit.Data;

/// <summary>
/// One token per UTF-8 byte of the text, as written (no normalisation: byte level means what you give is what
/// is seen). Tokens are spelled "&lt;XX&gt;" with two upper-case hex digits. <see cref="FixedVocabulary"/> gives
/// the closed vocabulary: pad = 0, unknown = 1 (never produced), byte b = b + 2.
/// </summary>
public sealed class ByteTokenizer : ITokenizer
{
    public const int ByteOffset = 2;
    static readonly string[] Spellings = Enumerable.Range(0, 256).Select(b => $"<{b:X2}>").ToArray();

    public string Name => "byte";

    public static string Spelling(byte b) => Spellings[b];

    public IReadOnlyList<string> Split(string text)
    {
        var bytes = Encoding.UTF8.GetBytes(text);
        var tokens = new string[bytes.Length];
        for (int i = 0; i < bytes.Length; i++) tokens[i] = Spellings[bytes[i]];
        return tokens;
    }

    /// <summary>The UTF-8 bytes as a string is encoded; a lone surrogate becomes U+FFFD (EF BF BD), as .NET's encoder does.</summary>
    public static byte[] Bytes(string text) => Encoding.UTF8.GetBytes(text);

    /// <summary>All 256 bytes in byte order after the two reserved ids, so ids do not depend on any data.</summary>
    public static Vocabulary FixedVocabulary() => Vocabulary.FromTokens(Spellings);
}
