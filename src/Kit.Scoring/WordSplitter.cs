using System.Globalization;
using System.Text;

namespace Kit.Scoring;

/// <summary>
/// Runs of letters, digits, combining marks, connector punctuation and letter/other numbers are one token; white
/// space separates and is dropped; any other character is a token alone. NFC first, optional invariant lower-casing.
/// </summary>
internal sealed class WordSplitter : TokenSplitter
{
    readonly bool _lower;

    public WordSplitter(bool lowerCase) => _lower = lowerCase;

    public override IReadOnlyList<string> Split(string text)
    {
        if (_lower) text = text.ToLowerInvariant();
        if (!text.IsNormalized(NormalizationForm.FormC)) text = text.Normalize(NormalizationForm.FormC);
        var tokens = new List<string>();
        var current = new StringBuilder();
        int pos = 0;
        while (pos < text.Length)
        {
            var status = Rune.DecodeFromUtf16(text.AsSpan(pos), out var rune, out int used);
            if (status != System.Buffers.OperationStatus.Done) rune = Rune.ReplacementChar;
            string piece = text.Substring(pos, used);
            pos += used;
            if (InWord(rune))
            {
                current.Append(piece);
                continue;
            }
            if (current.Length > 0)
            {
                tokens.Add(current.ToString());
                current.Clear();
            }
            if (!Rune.IsWhiteSpace(rune)) tokens.Add(piece);
        }
        if (current.Length > 0) tokens.Add(current.ToString());
        return tokens;
    }

    static bool InWord(Rune r) => Rune.IsLetterOrDigit(r) || Rune.GetUnicodeCategory(r) is UnicodeCategory.NonSpacingMark
        or UnicodeCategory.SpacingCombiningMark or UnicodeCategory.EnclosingMark or UnicodeCategory.ConnectorPunctuation
        or UnicodeCategory.LetterNumber or UnicodeCategory.OtherNumber;
}
