namespace Kit.Notebooks.Tests;

[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class ConsoleCollection
{
    public const string Name = "console";
}

/// <summary>`kit notebook run` exit codes and messages, through the CLI's own entry point.</summary>
[Collection(ConsoleCollection.Name)]
public class NotebookCommandTests
{
    static (int Code, string Out, string Err) Kit(params string[] args)
    {
        var (stdout, stderr) = (Console.Out, Console.Error);
        var (o, e) = (new StringWriter(), new StringWriter());
        Console.SetOut(o);
        Console.SetError(e);
        try { return (global::Kit.Cli.Program.Main(args), o.ToString(), e.ToString()); }
        finally { Console.SetOut(stdout); Console.SetError(stderr); }
    }

    [Fact]
    public void All_cells_passing_exits_0_and_writes_the_requested_files()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("ok.ipynb", "md:# ok", "var n = 2 + 2;", "n * 10");
        string outFile = Path.Combine(nb.Folder, "ok.out.ipynb"), htmlFile = Path.Combine(nb.Folder, "ok.html");

        var (code, stdout, stderr) = Kit("notebook", "run", path, "--out", outFile, "--html", htmlFile);

        Assert.True(code == 0, stderr);
        Assert.Contains("cell 3 ok", stdout);
        Assert.Contains("\"40\"", File.ReadAllText(outFile));
        Assert.Contains("all cells passed", File.ReadAllText(htmlFile));
    }

    [Fact]
    public void A_failing_cell_exits_1_with_its_number_on_stderr_and_still_writes_the_partial_notebook()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("bad.ipynb", "int a = 1;", "throw new Exception(\"second cell broke\");", "a");
        string outFile = Path.Combine(nb.Folder, "bad.out.ipynb");

        var (code, _, stderr) = Kit("notebook", "run", path, "--out", outFile);

        Assert.Equal(1, code);
        Assert.Contains("cell 2 failed: ", stderr);
        Assert.Contains("second cell broke", stderr);
        Assert.Contains("second cell broke", File.ReadAllText(outFile));
    }

    [Fact]
    public void A_missing_or_malformed_file_exits_2_naming_it()
    {
        using var nb = new TestNotebook();
        string missing = Path.Combine(nb.Folder, "absent.ipynb");
        var (code, _, stderr) = Kit("notebook", "run", missing);
        Assert.Equal(2, code);
        Assert.Contains(missing, stderr);

        string broken = nb.WriteRaw("broken.ipynb", "{ \"nbformat\": 4, \"cells\": [ ");
        (code, _, stderr) = Kit("notebook", "run", broken);
        Assert.Equal(2, code);
        Assert.Contains(broken + ":1:", stderr);
    }

    [Fact]
    public void A_missing_feed_folder_exits_2_naming_it()
    {
        using var nb = new TestNotebook();
        string path = nb.Write("x.ipynb", "1");
        string feed = Path.Combine(nb.Folder, "no-feed");
        var (code, _, stderr) = Kit("notebook", "run", path, "--feed", feed);
        Assert.Equal(2, code);
        Assert.Contains(feed, stderr);
    }
}
