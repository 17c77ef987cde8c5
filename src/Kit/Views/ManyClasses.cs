namespace Kit.Views;

/// <summary>
/// When the per-class views switch to forms that scale: above <see cref="Threshold"/> classes a heat map cell per
/// pair, a bar per class and score, a colour per class or a panel per class stops being readable, so the views
/// order, fold or pick instead (<see cref="ManyClassViews"/>). At or below it they keep their full forms.
/// </summary>
public static class ManyClasses
{
    /// <summary>More classes than this and the views switch (common practice, no source: about where 3 × k bars and k² numbers stop fitting a page width).</summary>
    public const int Threshold = 12;

    /// <summary>Classes kept in colour in a stacked chart; the rest fold into one "other" band. The palette's colours before its grey.</summary>
    public const int StackedKept = 7;

    /// <summary>Per-class reliability panels drawn; every class is listed in the table under them.</summary>
    public const int ReliabilityPanels = 6;

    /// <summary>Rows of the most-confused-pairs table.</summary>
    public const int ConfusedPairs = 15;

    public static bool Apply(int classes) => classes > Threshold;

    /// <summary>
    /// Estimated width in pixels of <paramref name="text"/> at <paramref name="fontSize"/> in the kit's sans-serif
    /// stack, a little generous (character classes measured roughly; common practice, no source). Used to size margins
    /// and to decide whether a number fits in a heat map cell, where the browser's own measure is not available.
    /// </summary>
    public static double TextWidth(string text, double fontSize)
    {
        double em = 0;
        foreach (char c in text ?? "")
            em += c switch
            {
                'i' or 'j' or 'l' or '.' or ',' or ':' or ';' or '|' or '!' or '\'' or 'I' or ' ' => 0.32,
                'f' or 't' or 'r' or '(' or ')' or '[' or ']' or '-' => 0.4,
                'm' or 'w' or 'M' or 'W' or '@' or '%' => 0.9,
                >= 'A' and <= 'Z' => 0.7,
                >= '0' and <= '9' => 0.58,
                _ => 0.6,
            };
        return em * fontSize * 1.08;
    }
}
