using System.Text.RegularExpressions;
using Kit.Views;

namespace Kit.Notebooks.Tests;

/// <summary>A result record that knows nothing about HTML; its view is registered from outside, as the kit's are.</summary>
public sealed record SampleSummary(string Name, double Score);

/// <summary>A second record whose view is registered only after the extension has loaded.</summary>
public sealed record LateSummary(int Count);

public class FormatterTests
{
    const string LoadExtension =
        "await new Kit.Notebooks.KitKernelExtension().OnLoadAsync(Microsoft.DotNet.Interactive.Kernel.Root);";

    static string Chart(string title) =>
        "new Kit.Views.ChartView(\"" + title + "\", new System.Text.Json.Nodes.JsonArray(new System.Text.Json.Nodes.JsonObject { [\"type\"] = \"bar\", [\"y\"] = new System.Text.Json.Nodes.JsonArray(1, 2) }), Kit.Views.Theme.Layout(\"" + title + "\", \"x\", \"y\"))";

    static int Count(string? haystack, string needle) => haystack is null ? 0 : Regex.Matches(haystack, Regex.Escape(needle)).Count;

    [Fact]
    public async Task A_view_displayed_in_the_kernel_becomes_html_with_its_fragment()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("view.ipynb", TestNotebook.ReferenceBuiltKit(), LoadExtension,
            "new Kit.Views.TextView(\"Counts\", \"<b data-probe=\\\"v1\\\">seven</b>\")");

        var result = await new NotebookRunner().RunAsync(path);

        Assert.True(result.Succeeded, result.FailureMessage);
        Assert.Contains(result.Cells[1].Outputs, o => o.Html?.Contains("Kit 0.1.0 loaded") == true);
        var html = result.Cells[2].Outputs.Single(o => o.Kind == CellOutput.Result).Html;
        Assert.NotNull(html);
        Assert.Contains("<b data-probe=\"v1\">seven</b>", html);
        Assert.Contains("<h2>Counts</h2>", html);
        Assert.Contains("data-role=\"kit-styles\"", html);
        Assert.DoesNotContain(PlotlyAsset.Marker, html);
    }

    [Fact]
    public async Task Plotly_is_sent_once_per_session_for_two_charts_and_again_in_a_new_session()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("charts.ipynb", TestNotebook.ReferenceBuiltKit(), LoadExtension, Chart("First"), "display(" + Chart("Second") + ");");

        var first = await new NotebookRunner().RunAsync(path);
        var second = await new NotebookRunner().RunAsync(path);

        foreach (var run in new[] { first, second })
        {
            Assert.True(run.Succeeded, run.FailureMessage);
            var html = run.Outputs.Select(o => o.Html).ToList();
            Assert.Equal(1, html.Sum(h => Count(h, PlotlyAsset.Marker)));
            Assert.Equal(2, html.Sum(h => Count(h, "data-kit-chart=\"1\"")));
            // The bundle precedes the first chart, so it is there when that chart's script runs.
            string firstChart = run.Cells[2].Outputs.Single(o => o.Kind == CellOutput.Result).Html!;
            Assert.True(firstChart.IndexOf(PlotlyAsset.Marker, StringComparison.Ordinal) < firstChart.IndexOf("data-kit-chart", StringComparison.Ordinal));
            Assert.Equal(0, Count(run.Cells[3].Outputs.Single().Html, PlotlyAsset.Marker));
        }
    }

    [Fact]
    public async Task A_record_with_a_registered_view_is_drawn_by_it_including_one_registered_after_loading()
    {
        ViewRegistry.Register<SampleSummary>(s => new TextView($"Summary of {s.Name}", $"<p data-probe=\"score\">{s.Score:F2}</p>"));
        using var nb = new TestNotebook();
        string path = nb.Write("records.ipynb", TestNotebook.ReferenceBuiltKit(), LoadExtension,
            "new Kit.Notebooks.Tests.SampleSummary(\"gru\", 0.8765)",
            "Kit.Views.ViewRegistry.Register<Kit.Notebooks.Tests.LateSummary>(s => new Kit.Views.TextView(\"Late\", $\"<p data-probe=\\\"late\\\">{s.Count}</p>\"));\nnew Kit.Notebooks.Tests.LateSummary(12)");

        var result = await new NotebookRunner().RunAsync(path);

        Assert.True(result.Succeeded, result.FailureMessage);
        string early = result.Cells[2].Outputs.Single(o => o.Kind == CellOutput.Result).Html!;
        Assert.Contains("<h2>Summary of gru</h2>", early);
        Assert.Contains("<p data-probe=\"score\">0.88</p>", early);
        string late = result.Cells[3].Outputs.Single(o => o.Kind == CellOutput.Result).Html!;
        Assert.Contains("<p data-probe=\"late\">12</p>", late);
    }

    [Fact]
    public async Task The_html_export_embeds_plotly_once_in_the_head_and_keeps_every_chart()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("export.ipynb", "md:# Export <check>", TestNotebook.ReferenceBuiltKit(), LoadExtension, Chart("One"), Chart("Two"), "Console.WriteLine(\"a < b\");");
        var result = await new NotebookRunner().RunAsync(path);
        Assert.True(result.Succeeded, result.FailureMessage);

        string file = Path.Combine(nb.Folder, "export.html");
        result.SaveHtml(file, "Export check");
        string page = File.ReadAllText(file);

        Assert.Equal(1, Count(page, PlotlyAsset.Marker));
        Assert.True(page.IndexOf(PlotlyAsset.Marker, StringComparison.Ordinal) < page.IndexOf("<body>", StringComparison.Ordinal));
        Assert.Equal(2, Count(page, "data-kit-chart=\"1\""));
        Assert.Contains("<h1>Export &lt;check&gt;</h1>", page);
        Assert.Contains("a &lt; b", page);
        Assert.Contains("all cells passed", page);
        Assert.Contains(Cautions.Lines[0], page.Replace("&#39;", "'"));
    }

    [Fact]
    public void Outside_a_kernel_a_chart_fragment_carries_what_it_needs()
    {
        var view = new ChartView("Alone", new System.Text.Json.Nodes.JsonArray(), Theme.Layout("Alone", "x", "y"));
        string html = ViewFormatters.Render(view);
        Assert.Equal(1, Count(html, PlotlyAsset.Marker));
        Assert.Equal(1, Count(html, "data-role=\"kit-styles\""));
    }

    [Fact]
    public void The_fragment_styles_scope_the_report_colours_to_kit_elements_and_leave_the_page_alone()
    {
        Assert.Contains("section.kit-section, table.kit-table, figure.kit-chart { --ink:", SessionAssets.FragmentCss);
        Assert.DoesNotContain(":root", SessionAssets.FragmentCss);
        Assert.DoesNotContain("body {", SessionAssets.FragmentCss);
        Assert.Contains("table.kit-table td.num", SessionAssets.FragmentCss);
    }
}
