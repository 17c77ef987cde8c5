using System.Text;
using Kit.Views;
using Microsoft.DotNet.Interactive.Formatting;
using Html = Kit.Views.Html;

namespace Kit.Notebooks;

/// <summary>
/// Teaches the kernel's formatter to draw kit views and every record that has a view in <see cref="ViewRegistry"/>.
/// The formatter is process-wide, so registration happens once per process however many kernels load the kit.
/// </summary>
public static class ViewFormatters
{
    static readonly object Gate = new();
    static readonly HashSet<Type> Done = new();

    public static void RegisterAll()
    {
        lock (Gate)
        {
            if (Done.Add(typeof(IView)))
            {
                Formatter.Register<IView>((view, writer) => writer.Write(Render(view)), HtmlFormatter.MimeType);
                Formatter.Register<IView>((view, writer) => writer.Write(view.Title), PlainTextFormatter.MimeType);
                Formatter.SetPreferredMimeTypesFor(typeof(IView), HtmlFormatter.MimeType, PlainTextFormatter.MimeType);
                ViewRegistry.Registered += RegisterRecord;
            }
        }
        foreach (var type in ViewRegistry.Types) RegisterRecord(type);
    }

    static void RegisterRecord(Type type)
    {
        lock (Gate)
            if (!Done.Add(type)) return;
        Formatter.Register(type, (value, writer) =>
        {
            if (ViewRegistry.TryGetView(value, out var view)) writer.Write(Render(view));
            else writer.Write(Html.Escape(value?.ToString()));
        }, HtmlFormatter.MimeType);
        Formatter.Register(type, (value, writer) =>
            writer.Write(ViewRegistry.TryGetView(value, out var view) ? view.Title : value?.ToString()), PlainTextFormatter.MimeType);
        Formatter.SetPreferredMimeTypesFor(type, HtmlFormatter.MimeType, PlainTextFormatter.MimeType);
    }

    /// <summary>A view as one notebook output: session prelude (styles, plotly.js once), heading, fragment.</summary>
    public static string Render(IView view)
    {
        string body = view.ToHtml();
        bool charts = view is IChartView { ChartCount: > 0 } || body.Contains("data-kit-chart=", StringComparison.Ordinal);
        return new StringBuilder()
            .Append(SessionAssets.Prelude(charts))
            .Append("<section class=\"kit-section\"><h2>").Append(Html.Escape(view.Title)).Append("</h2>")
            .Append(body).Append("</section>")
            .ToString();
    }
}
