namespace Kit.Notebooks.Tests;

public class NotebookRunnerTests
{
    [Fact]
    public async Task Stops_at_the_failing_cell_and_reports_its_number_and_error()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("fails-at-2.ipynb",
            "var reached = new List<int> { 1 };",
            "throw new InvalidOperationException(\"boom in the second cell\");",
            "reached.Add(3);");

        var result = await new NotebookRunner().RunAsync(path);

        Assert.False(result.Succeeded);
        Assert.Equal(2, result.Failure!.Number);
        Assert.StartsWith("cell 2 failed: ", result.FailureMessage);
        Assert.Contains("boom in the second cell", result.FailureMessage);
        Assert.Equal(new[] { CellStatus.Passed, CellStatus.Failed, CellStatus.NotRun }, result.Cells.Select(c => c.Status));
        Assert.Contains(result.Cells[1].Outputs, o => o.Kind == CellOutput.Error && o.Text!.Contains("boom in the second cell"));
    }

    [Fact]
    public async Task A_compile_error_fails_its_cell_and_markdown_cells_count_in_the_numbering()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("compile.ipynb", "md:# Title", "int a = 1;", "int b = undefinedName + 1;", "md:after");

        var result = await new NotebookRunner().RunAsync(path);

        Assert.Equal(3, result.Failure!.Number);
        Assert.Contains("CS0103", result.FailureMessage);
        Assert.Contains("undefinedName", result.FailureMessage);
        Assert.Equal(CellStatus.Text, result.Cells[0].Status);
    }

    [Fact]
    public async Task Collects_plain_text_results_and_standard_output_and_saves_an_executed_notebook()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("values.ipynb", "Console.WriteLine(\"printed \" + (6 * 7));", "new[] { 3, 1, 2 }.Sum() * 10");

        var result = await new NotebookRunner().RunAsync(path);
        Assert.True(result.Succeeded, result.FailureMessage);
        Assert.Contains(result.Cells[0].Outputs, o => o.Kind == CellOutput.StandardOutput && o.Text!.Contains("printed 42"));
        Assert.Contains(result.Cells[1].Outputs, o => o.Kind == CellOutput.Result && o.Text == "60");

        string saved = Path.Combine(nb.Folder, "out", "values.executed.ipynb");
        result.SaveNotebook(saved);
        var reread = NotebookFile.Load(saved);
        Assert.Equal(2, reread.Elements.Count);
        Assert.Equal(2, reread.Elements[1].ExecutionOrder);
        string json = File.ReadAllText(saved);
        Assert.Contains("printed 42", json);
        Assert.Contains("\"60\"", json);
    }

    [Fact]
    public async Task Cells_run_in_the_notebook_folder_and_the_process_folder_is_restored()
    {
        using var nb = new TestNotebook();
        File.WriteAllText(Path.Combine(nb.Folder, "beside.txt"), "found beside the notebook");
        string path = nb.Write("cwd.ipynb", "System.IO.File.ReadAllText(\"beside.txt\")");

        var result = await new NotebookRunner().RunAsync(path);

        Assert.True(result.Succeeded, result.FailureMessage);
        Assert.Equal("found beside the notebook", result.Cells[0].Outputs.Single(o => o.Kind == CellOutput.Result).Text);
        // Other runs in this process may hold the working directory now, but never this notebook's folder.
        Assert.NotEqual(nb.Folder, Environment.CurrentDirectory);
    }

    [Fact]
    public async Task A_relative_package_folder_is_refused_with_an_explanation_before_the_kernel_sees_it()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("relative.ipynb", "int x = 1;", "#i \"nuget: ../artifacts/feed\"\n#r \"nuget: Kit.Notebooks, 0.1.0\"");

        var result = await new NotebookRunner().RunAsync(path);

        Assert.Equal(2, result.Failure!.Number);
        Assert.Contains("relative folder", result.FailureMessage);
        Assert.Contains("docs/notebooks.md", result.FailureMessage);
    }

    [Fact]
    public async Task A_missing_package_source_fails_setup_not_a_cell()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("setup.ipynb", "1");
        var runner = new NotebookRunner { PackageSources = new[] { "http://[bad" } };

        var result = await runner.RunAsync(path);

        Assert.False(result.Succeeded);
        Assert.Equal(0, result.Failure!.Number);
        Assert.StartsWith("package source setup failed: ", result.FailureMessage);
        Assert.Equal(CellStatus.NotRun, result.Cells.Single(c => c.Number == 1).Status);
    }

    [Fact]
    public async Task A_cell_that_runs_too_long_fails_with_the_limit_named()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("slow.ipynb", "await Task.Delay(TimeSpan.FromSeconds(30));", "1");
        var runner = new NotebookRunner { CellTimeout = TimeSpan.FromSeconds(2) };

        var result = await runner.RunAsync(path);

        Assert.Equal(1, result.Failure!.Number);
        Assert.Contains("within 2 s", result.FailureMessage);
    }

    [Fact]
    public async Task Raw_cells_are_not_run_as_code()
    {
        using var nb = new TestNotebook();
        string path = nb.WriteRaw("raw.ipynb", """
            {"nbformat": 4, "nbformat_minor": 5, "metadata": {}, "cells": [
              {"cell_type": "raw", "metadata": {}, "source": "this is not C# at all"},
              {"cell_type": "code", "metadata": {}, "source": "40 + 2", "outputs": [], "execution_count": null}]}
            """);

        var result = await new NotebookRunner().RunAsync(path);

        Assert.True(result.Succeeded, result.FailureMessage);
        Assert.Equal(CellStatus.Text, result.Cells[0].Status);
        Assert.Equal("42", result.Cells[1].Outputs.Single(o => o.Kind == CellOutput.Result).Text);
    }
}
