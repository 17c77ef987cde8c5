using System.Text.Json.Nodes;

namespace Kit.Notebooks.Tests;

/// <summary>The notebooks as committed: the agreed set, nbformat 4, no outputs, a question first, the kit loaded from its package.</summary>
public class NotebookRulesTests
{
    static readonly string Folder = Path.Combine(LocalFeed.FindRepoRoot(AppContext.BaseDirectory), "notebooks");

    public static TheoryData<string> Notebooks() => FeedFixture.Notebooks();

    [Fact]
    public void The_analysis_notebooks_are_all_there()
    {
        string[] expected =
        {
            "01-first-look.ipynb", "02-compare-cells-and-sizes.ipynb", "03-calibration.ipynb",
            "04-accuracy-by-length.ipynb", "05-embeddings.ipynb", "06-your-own-csv.ipynb",
        };
        var present = Directory.EnumerateFiles(Folder, "*.ipynb").Select(Path.GetFileName).ToHashSet();
        Assert.All(expected, name => Assert.Contains(name, present));
    }

    [Theory]
    [MemberData(nameof(Notebooks))]
    public void Loading_the_package_is_all_the_set_up_a_notebook_needs_and_sections_are_reached_by_name(string name)
    {
        var notebook = JsonNode.Parse(File.ReadAllText(Path.Combine(Folder, name)))!;
        var code = notebook["cells"]!.AsArray().Where(c => (string)c!["cell_type"]! == "code")
            .Select(c => ChartMarkers.Text(c!["source"])!).ToArray();
        // The extension imports the kit's namespaces on load, so no cell starts with using lines.
        Assert.DoesNotContain(code, c => System.Text.RegularExpressions.Regex.IsMatch(c, @"^\s*using\s+[\w.]+;", System.Text.RegularExpressions.RegexOptions.Multiline));
        // Report parts by name, never by list position (a new view would shift them).
        Assert.DoesNotContain(code, c => System.Text.RegularExpressions.Regex.IsMatch(c, @"report\.(Take|Skip|ElementAt)\(|report\[\d"));
    }

    [Theory]
    [MemberData(nameof(Notebooks))]
    public void Committed_without_outputs_opening_with_the_question_and_loading_the_package(string name)
    {
        var notebook = JsonNode.Parse(File.ReadAllText(Path.Combine(Folder, name)))!;
        Assert.Equal(4, notebook["nbformat"]!.GetValue<int>());
        Assert.Equal(".net-csharp", notebook["metadata"]!["kernelspec"]!["name"]!.GetValue<string>());
        var cells = notebook["cells"]!.AsArray();

        Assert.Equal("markdown", cells[0]!["cell_type"]!.GetValue<string>());
        string opening = ChartMarkers.Text(cells[0]!["source"])!;
        Assert.StartsWith("# ", opening);
        Assert.Contains("**Question this notebook answers:**", opening);

        var code = cells.Where(c => c!["cell_type"]!.GetValue<string>() == "code").ToArray();
        Assert.All(code, c =>
        {
            Assert.Empty(c!["outputs"]!.AsArray());
            Assert.Null(c["execution_count"]);
        });
        string version = LocalFeed.PackageVersion(LocalFeed.FindRepoRoot(AppContext.BaseDirectory));
        Assert.Equal($"#r \"nuget: Kit.Notebooks, {version}\"", ChartMarkers.Text(code[0]!["source"])!.Trim());
        // A machine-specific feed path would break the notebook everywhere else (docs/notebooks.md).
        Assert.DoesNotContain(code, c => ChartMarkers.Text(c!["source"])!.Contains("#i ", StringComparison.Ordinal));
        // The analysis notebooks explain each chart in prose; the smoke notebook only checks that loading works.
        if (!name.StartsWith("00-", StringComparison.Ordinal))
            Assert.True(cells.Count(c => c!["cell_type"]!.GetValue<string>() == "markdown") >= 4, $"{name}: too little explanation");
    }
}
