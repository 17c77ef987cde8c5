namespace Kit.Views;

/// <summary>
/// Something that renders as an HTML fragment: a table, a chart or a block of text. Fragments never carry
/// plotly.js themselves; the page (report or notebook) provides it once.
/// </summary>
public interface IView
{
    string Title { get; }
    string ToHtml();
}

/// <summary>A view that draws one or more charts (used to count charts when checking a rendered page).</summary>
public interface IChartView : IView
{
    int ChartCount { get; }
}
