using System.Text;

namespace Kit.Views;

/// <summary>
/// Several views under one heading (e.g. a table with the two charts that belong to it). Counts the charts
/// of its parts, so a page's expected chart count stays right however views are grouped.
/// </summary>
public sealed class StackView(string title, IReadOnlyList<IView> parts) : IChartView
{
    public string Title { get; } = title;
    public IReadOnlyList<IView> Parts { get; } = parts;
    public int ChartCount => Parts.Sum(p => p is IChartView c ? c.ChartCount : 0);

    public string ToHtml()
    {
        var sb = new StringBuilder("<div class=\"kit-stack\">");
        foreach (var part in Parts) sb.Append(part.ToHtml());
        return sb.Append("</div>").ToString();
    }

    /// <summary>Every single chart inside a list of views, in page order (stacks opened up).</summary>
    public static IEnumerable<ChartView> ChartsIn(IEnumerable<IView> views)
    {
        foreach (var view in views)
        {
            if (view is ChartView chart) yield return chart;
            else if (view is StackView stack)
                foreach (var inner in ChartsIn(stack.Parts)) yield return inner;
        }
    }
}
