using System.Text;

namespace Kit.Data;

/// <summary>
/// The form under which two texts count as "the same after normalisation": Unicode NFKC (so full-width and
/// ligature forms match their plain forms), invariant lower case, white-space runs as one space, trimmed.
/// </summary>
public static class TextKey
{
    public static string Normalise(string text)
    {
        var s = text.Normalize(NormalizationForm.FormKC).ToLowerInvariant();
        var sb = new StringBuilder(s.Length);
        bool space = false;
        foreach (char c in s)
        {
            if (char.IsWhiteSpace(c)) { space = sb.Length > 0; continue; }
            if (space) { sb.Append(' '); space = false; }
            sb.Append(c);
        }
        return sb.ToString();
    }
}
