using System.Globalization;
using System.Text;

namespace Kit.Scoring;

/// <summary>
/// One token per extended grapheme cluster (UAX #29) of the NFC text, after optional invariant lower-casing.
/// Pure ASCII without CR is one token per char (CR LF is a single cluster, GB3).
/// </summary>
internal sealed class CharacterSplitter : TokenSplitter
{
    readonly bool _fold;

    public CharacterSplitter(bool foldCase) => _fold = foldCase;

    public override IReadOnlyList<string> Split(string text)
    {
        if (_fold) text = text.ToLowerInvariant();
        bool ascii = !text.AsSpan().ContainsAnyExceptInRange('\0', '\x7F');
        if (ascii && !text.Contains('\r'))
        {
            var one = new string[text.Length];
            for (int i = 0; i < one.Length; i++) one[i] = text[i].ToString();
            return one;
        }
        if (!text.IsNormalized(NormalizationForm.FormC)) text = text.Normalize(NormalizationForm.FormC);
        var tokens = new List<string>(text.Length);
        var e = StringInfo.GetTextElementEnumerator(text);
        while (e.MoveNext()) tokens.Add(e.GetTextElement());
        return tokens;
    }
}
