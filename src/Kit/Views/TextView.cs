namespace Kit.Views;

/// <summary>A heading with a paragraph or a prepared HTML fragment (tables, notes).</summary>
public sealed class TextView(string title, string html) : IView
{
    public string Title { get; } = title;
    public string ToHtml() => html;

    public static TextView Paragraph(string title, string text) => new(title, $"<p>{Html.Escape(text)}</p>");
}
