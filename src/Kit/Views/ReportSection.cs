namespace Kit.Views;

/// <summary>One named part of a report (e.g. "calibration"): a title and the views under it, in reading order.</summary>
public sealed record ReportSection(string Name, string Title, IReadOnlyList<IView> Views)
{
    /// <summary>The section as one view (what a notebook shows for it).</summary>
    public StackView AsView() => new(Title, Views);

    public override string ToString() => $"{Name}: {Title} ({Views.Count} view(s))";
}
