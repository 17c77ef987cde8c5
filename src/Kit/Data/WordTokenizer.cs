using System.Globalization;
using System.Text;

namespace Kit.Data;

/// <summary>
/// Words: runs of letters, digits, combining marks and connector punctuation (underscore) are one token;
/// white space separates tokens and is dropped; every other character (punctuation, symbols) is a token of
/// its own, so "don't!" is "don", "'", "t", "!". Text is put in NFC first, and lower-cased (invariant) by default.
/// </summary>
public sealed class WordTokenizer : ITokenizer
{
    public bool LowerCase { get; }
    public string Name => LowerCase ? "word-lower" : "word";

    public WordTokenizer(bool lowerCase = true) => LowerCase = lowerCase;

    public IReadOnlyList<string> Split(string text)
    {
        if (LowerCase) text = text.ToLowerInvariant();
        if (!text.IsNormalized(NormalizationForm.FormC)) text = text.Normalize(NormalizationForm.FormC);
        var tokens = new List<string>();
        int pos = 0, wordStart = -1;
        while (pos < text.Length)
        {
            if (Rune.DecodeFromUtf16(text.AsSpan(pos), out var rune, out int used) != System.Buffers.OperationStatus.Done)
                rune = Rune.ReplacementChar;
            if (IsWordPart(rune))
            {
                if (wordStart < 0) wordStart = pos;
            }
            else
            {
                if (wordStart >= 0) { tokens.Add(text[wordStart..pos]); wordStart = -1; }
                if (!Rune.IsWhiteSpace(rune)) tokens.Add(text.Substring(pos, used));
            }
            pos += used;
        }
        if (wordStart >= 0) tokens.Add(text[wordStart..]);
        return tokens;
    }

    static bool IsWordPart(Rune r)
    {
        if (Rune.IsLetterOrDigit(r)) return true;
        var category = Rune.GetUnicodeCategory(r);
        return category is UnicodeCategory.NonSpacingMark or UnicodeCategory.SpacingCombiningMark or UnicodeCategory.EnclosingMark
            or UnicodeCategory.ConnectorPunctuation or UnicodeCategory.LetterNumber or UnicodeCategory.OtherNumber;
    }
}
