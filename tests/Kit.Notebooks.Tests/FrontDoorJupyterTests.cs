using System.Text.RegularExpressions;
using Xunit.Abstractions;

namespace Kit.Notebooks.Tests;

/// <summary>
/// The notebook front door as Jupyter (nbconvert with the .NET kernel) shows it: loading the package registers a
/// view for every result record and says how many, and a cell that ends in a record shows that record's view.
/// </summary>
[Collection(FeedCollection.Name)]
public class FrontDoorJupyterTests(FeedFixture feed, ITestOutputHelper output)
{
    const string FirstLook = "01-first-look.ipynb";

    [JupyterFact]
    public async Task A_cell_ending_in_a_metrics_record_shows_its_table_and_the_load_line_counts_the_record_views()
    {
        RequiredTool.Jupyter.Demand();
        var run = await feed.ExecutedByJupyter(FirstLook);
        Assert.True(run.Result.ExitCode == 0, $"{FirstLook}: nbconvert exited {run.Result.ExitCode}:\n{run.Result.Tail()}");
        var cells = run.Executed["cells"]!.AsArray().Where(c => c!["cell_type"]!.GetValue<string>() == "code").ToArray();
        var html = ChartMarkers.HtmlByCodeCell(run.Executed);

        var load = Regex.Match(string.Concat(html[0]), @"views for (\d+) record types");
        Assert.True(load.Success, "the #r cell does not say how many record types have views");
        output.WriteLine(load.Value);
        Assert.InRange(int.Parse(load.Groups[1].Value), 12, 1000);

        int metricsCell = Array.FindIndex(cells, c => ChartMarkers.Text(c!["source"])!.Trim() == "run.TestMetrics");
        Assert.True(metricsCell >= 0, $"{FirstLook} has no cell ending in run.TestMetrics");
        string shown = string.Concat(html[metricsCell]);
        Assert.Contains("Headline metrics on the test split", shown);
        Assert.Contains("macro F1", shown);
        Assert.Contains("<table", shown);
        // The record's view, not the kernel's default object dump of its properties.
        Assert.DoesNotContain("PerClass", shown);
    }
}
