using System.Globalization;
using System.Text;

namespace Kit.Data;

/// <summary>
/// One token per user-perceived character: the text is put in Unicode NFC, optionally case-folded, then cut into
/// text elements (extended grapheme clusters, UAX #29), so a surrogate pair or a letter with its combining marks
/// stays one token. Case folding here is invariant-culture lower-casing (simple folding; .NET has no full
/// case folding), applied before normalisation so the result is NFC.
/// </summary>
public sealed class CharacterTokenizer : ITokenizer
{
    static readonly string[] Ascii = Enumerable.Range(0, 128).Select(c => ((char)c).ToString()).ToArray();

    public bool FoldCase { get; }
    public string Name => FoldCase ? "character-folded" : "character";

    public CharacterTokenizer(bool foldCase = false) => FoldCase = foldCase;

    public IReadOnlyList<string> Split(string text)
    {
        if (FoldCase) text = text.ToLowerInvariant();
        if (!text.IsNormalized(NormalizationForm.FormC)) text = text.Normalize(NormalizationForm.FormC);
        var tokens = new List<string>(text.Length);
        var span = text.AsSpan();
        int pos = 0;
        while (pos < span.Length)
        {
            int length = StringInfo.GetNextTextElementLength(span[pos..]);
            char c = span[pos];
            tokens.Add(length == 1 && c < 128 ? Ascii[c] : text.Substring(pos, length));
            pos += length;
        }
        return tokens;
    }
}
