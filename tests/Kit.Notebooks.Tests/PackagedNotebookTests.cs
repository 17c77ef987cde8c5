using System.IO.Compression;

namespace Kit.Notebooks.Tests;

/// <summary>Notebooks as a user runs them: the kit restored from the packed feed, the extension loaded by #r.</summary>
[Collection(FeedCollection.Name)]
public class PackagedNotebookTests(FeedFixture feed)
{
    public static TheoryData<string> Notebooks() => FeedFixture.Notebooks();

    [Theory]
    [MemberData(nameof(Notebooks))]
    public async Task Every_notebook_runs_to_the_end_and_ends_with_charts(string name)
    {
        var result = await feed.Executed(name);
        Assert.True(result.Succeeded, $"{name}: {result.FailureMessage}");
        var code = result.Cells.Where(c => c.Status != CellStatus.Text).ToArray();
        Assert.All(code, c => Assert.Equal(CellStatus.Passed, c.Status));
        Assert.Equal(CellStatus.Text, result.Cells[0].Status);
        // "Ends with the charts a report needs": the last code cell draws at least one chart.
        Assert.True(code[^1].Outputs.Sum(o => ChartMarkers.Charts(o.Html)) > 0, $"{name}: the last code cell draws no chart");
        // Loading the kit loaded the engine too: the notebooks train models.
        Assert.Contains(result.Outputs, o => o.Html?.Contains("Kit 0.1.0 loaded · engine: ") == true);
        Assert.DoesNotContain(result.Outputs, o => o.Html?.Contains("engine not loaded") == true);
    }

    [Fact]
    public void The_package_carries_the_extension_where_the_kernel_looks_and_depends_on_the_kit()
    {
        string version = LocalFeed.PackageVersion(feed.RepoRoot);
        using var zip = ZipFile.OpenRead(Path.Combine(feed.Feed, $"Kit.Notebooks.{version}.nupkg"));
        var names = zip.Entries.Select(e => e.FullName).ToList();
        Assert.Contains("interactive-extensions/dotnet/Kit.Notebooks.dll", names);
        Assert.Contains("lib/net10.0/Kit.Notebooks.dll", names);
        using var nuspec = new StreamReader(zip.GetEntry("Kit.Notebooks.nuspec")!.Open());
        string text = nuspec.ReadToEnd();
        Assert.Contains($"<dependency id=\"Kit\" version=\"{version}\"", text);
        Assert.True(File.Exists(Path.Combine(feed.Feed, $"Kit.{version}.nupkg")));
    }

    [Fact]
    public async Task Referencing_the_package_loads_the_extension_the_engine_and_the_formatters()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("load.ipynb",
            $"#r \"nuget: Kit.Notebooks, {LocalFeed.PackageVersion(feed.RepoRoot)}\"",
            "TorchSharp.torch.arange(4).sum().item<long>()",
            "new Kit.Views.TextView(\"From the package\", \"<i data-probe=\\\"pkg\\\">ok</i>\")");

        var result = await feed.Runner().RunAsync(path);

        Assert.True(result.Succeeded, result.FailureMessage);
        Assert.Contains(result.Cells[0].Outputs, o => o.Html?.Contains("Kit 0.1.0 loaded · engine: ") == true);
        // 0 + 1 + 2 + 3
        Assert.Equal("6", result.Cells[1].Outputs.Single(o => o.Kind == CellOutput.Result).Text);
        Assert.Contains("<i data-probe=\"pkg\">ok</i>", result.Cells[2].Outputs.Single(o => o.Kind == CellOutput.Result).Html);
    }
}
