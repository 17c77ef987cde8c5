namespace Kit.Data;

/// <summary>
/// Which source columns hold the text, the label and, optionally, a group key (rows that must stay in one part
/// of a split) and a predefined split assignment (values such as train / validation / test).
/// </summary>
public sealed record ColumnSpec(string Text = "text", string Label = "label", string? Group = null, string? Split = null)
{
    internal IEnumerable<string> Required()
    {
        yield return Text;
        yield return Label;
        if (Group is not null) yield return Group;
        if (Split is not null) yield return Split;
    }
}
