using System.Text.Json.Nodes;
using Xunit.Abstractions;

namespace Kit.Notebooks.Tests;

/// <summary>
/// Every repository notebook executed by the real client — Debian's Jupyter (nbconvert, nbclient) with the .NET
/// kernel — from the packed feed, and compared with the embedded runner's execution of the same file.
/// </summary>
[Collection(FeedCollection.Name)]
public class JupyterNotebookTests(FeedFixture feed, ITestOutputHelper output)
{
    public static TheoryData<string> Notebooks() => FeedFixture.Notebooks();

    [JupyterTheory]
    [MemberData(nameof(Notebooks))]
    public async Task Jupyter_with_the_dotnet_kernel_executes_the_notebook_with_the_same_charts_as_the_runner(string name)
    {
        RequiredTool.Jupyter.Demand();
        var run = await feed.ExecutedByJupyter(name);
        output.WriteLine($"{JupyterClient.Description}\n{name}: exit {run.Result.ExitCode} after {run.Result.Elapsed.TotalSeconds:F1} s; executed copy {run.ExecutedCopy}");
        Assert.True(run.Result.ExitCode == 0, $"{name}: nbconvert exited {run.Result.ExitCode}:\n{run.Result.Tail()}");

        var cells = run.Executed["cells"]!.AsArray().Where(c => c!["cell_type"]!.GetValue<string>() == "code").ToArray();
        Assert.All(cells, c =>
        {
            Assert.NotNull(c!["execution_count"]);
            Assert.DoesNotContain(c["outputs"]!.AsArray(), o => o!["output_type"]!.GetValue<string>() == "error");
        });
        var html = ChartMarkers.HtmlByCodeCell(run.Executed);
        string all = string.Concat(html.SelectMany(h => h));
        Assert.Contains("Kit 0.1.0 loaded · engine: ", all);
        Assert.DoesNotContain("engine not loaded", all);

        // The same cells draw the same number of charts in both clients, and the session sends plotly.js once.
        var embedded = await feed.Executed(name);
        Assert.True(embedded.Succeeded, embedded.FailureMessage);
        int[] runnerCharts = embedded.Cells.Where(c => c.Status != CellStatus.Text).Select(c => c.Outputs.Sum(o => ChartMarkers.Charts(o.Html))).ToArray();
        int[] jupyterCharts = html.Select(h => h.Sum(ChartMarkers.Charts)).ToArray();
        Assert.Equal(runnerCharts, jupyterCharts);
        Assert.True(jupyterCharts[^1] > 0, $"{name}: the last code cell drew no chart in Jupyter");
        Assert.Equal(1, html.SelectMany(h => h).Sum(ChartMarkers.Bundles));
    }

    [Fact]
    public void The_workspace_config_names_the_feed_only_for_kit_packages_and_clears_other_sources()
    {
        using var workspace = JupyterWorkspace.Create(feed.RepoRoot, feed.Feed, "00-smoke.ipynb");
        var config = System.Xml.Linq.XDocument.Load(Path.Combine(Path.GetDirectoryName(workspace.Notebook)!, "NuGet.Config")).Root!;
        var sources = config.Element("packageSources")!;
        Assert.Equal("clear", sources.Elements().First().Name.LocalName);
        Assert.Equal(feed.Feed, sources.Elements("add").Single(e => (string?)e.Attribute("key") == "kit-under-test").Attribute("value")!.Value);
        var mapped = config.Element("packageSourceMapping")!.Elements("packageSource")
            .ToDictionary(e => (string)e.Attribute("key")!, e => e.Elements("package").Select(p => (string)p.Attribute("pattern")!).ToArray());
        Assert.Equal(new[] { "Kit", "Kit.Notebooks" }, mapped["kit-under-test"]);
        Assert.Equal(new[] { "*" }, mapped["nuget.org"]);
        // ../data-demo from the copy reaches the repository's demo data, as it does from notebooks/.
        Assert.True(File.Exists(Path.Combine(Path.GetDirectoryName(workspace.Notebook)!, "..", "data-demo", "hostnames.csv")));
        string root = workspace.Root;
        workspace.Dispose();
        Assert.False(Directory.Exists(root));
        Assert.True(File.Exists(Path.Combine(feed.RepoRoot, "data-demo", "hostnames.csv")));
    }
}
