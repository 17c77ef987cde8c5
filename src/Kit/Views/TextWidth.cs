namespace Kit.Views;

/// <summary>
/// An estimate of how wide a line of text draws, for layouts that must leave room for labels before a browser
/// measures them. Advance widths are those of a typical sans-serif face (Helvetica/Arial class) in ems, grouped
/// into five classes; from memory of such fonts' metrics, rounded up so the estimate errs wide. The browser
/// test of the rendered report checks the result.
/// </summary>
public static class TextWidth
{
    /// <summary>Width in pixels of <paramref name="text"/> at <paramref name="fontSize"/> pixels.</summary>
    public static double Pixels(string text, double fontSize)
    {
        double ems = 0;
        foreach (char ch in text) ems += Advance(ch);
        return ems * fontSize;
    }

    static double Advance(char ch) => ch switch
    {
        'i' or 'j' or 'l' or '.' or ',' or ':' or ';' or '\'' or '|' or '!' or 'I' => 0.28,
        ' ' or 'f' or 't' or 'r' or '(' or ')' or '[' or ']' or '-' or '·' or '/' => 0.36,
        'm' or 'w' or 'M' or 'W' or '%' or '—' or '×' => 0.9,
        >= 'A' and <= 'Z' => 0.7,
        >= '0' and <= '9' => 0.56,
        _ when ch > 0x2000 => 0.8,   // other symbols and wide scripts: err wide
        _ => 0.56,
    };
}
