namespace Kit.Notebooks.Tests;

public class NotebookFileTests
{
    [Fact]
    public async Task Truncated_json_is_reported_with_the_file_and_line()
    {
        using var nb = new TestNotebook();
        string path = nb.WriteRaw("broken.ipynb", "{\n \"cells\": [\n  {\"cell_type\": \"code\",\n");

        var e = await Assert.ThrowsAsync<NotebookFormatException>(() => new NotebookRunner().RunAsync(path));

        Assert.Equal(path, e.Path);
        Assert.StartsWith(path + ":", e.Message);
        Assert.Contains("not valid JSON", e.Message);
        Assert.NotNull(e.Line);
        Assert.InRange(e.Line!.Value, 3, 4);
    }

    [Fact]
    public void A_missing_file_is_named()
    {
        string path = Path.Combine(Path.GetTempPath(), "kit-no-such-notebook-" + Guid.NewGuid().ToString("N") + ".ipynb");
        var e = Assert.Throws<NotebookFormatException>(() => NotebookFile.Load(path));
        Assert.Equal($"{path}: file not found", e.Message);
    }

    [Theory]
    [InlineData("[1, 2]", "expected a JSON object")]
    [InlineData("{\"cells\": []}", "no \"nbformat\"")]
    [InlineData("{\"nbformat\": 3, \"cells\": []}", "nbformat 3 is not supported")]
    [InlineData("{\"nbformat\": 4, \"metadata\": {}}", "no \"cells\" array")]
    [InlineData("{\"nbformat\": 4, \"cells\": [{\"cell_type\": \"code\", \"source\": \"1\"}, {\"source\": \"2\"}]}", "cell 2 has no \"cell_type\"")]
    [InlineData("{\"nbformat\": 4, \"cells\": [{\"cell_type\": \"code\", \"source\": 7}]}", "cell 1 has no \"source\" text")]
    public void Shapes_that_are_not_a_notebook_are_named(string json, string problem)
    {
        using var nb = new TestNotebook();
        string path = nb.WriteRaw("odd.ipynb", json);
        var e = Assert.Throws<NotebookFormatException>(() => NotebookFile.Load(path));
        Assert.StartsWith(path, e.Message);
        Assert.Contains(problem, e.Message);
    }
}
