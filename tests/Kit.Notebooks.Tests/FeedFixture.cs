using System.Collections.Concurrent;

namespace Kit.Notebooks.Tests;

/// <summary>
/// Packs Kit and Kit.Notebooks into artifacts/feed once per test run, and only when their sources changed since
/// the last pack, so notebooks restore exactly the code under test. Each repository notebook is executed by the
/// embedded runner, and by Jupyter, at most once per test run; the runner test, the real-client test (which
/// compares its charts with the runner's) and the browser tests share those results.
/// </summary>
public sealed class FeedFixture
{
    readonly ConcurrentDictionary<string, Lazy<Task<NotebookRunResult>>> _executed = new(StringComparer.Ordinal);
    readonly ConcurrentDictionary<string, Lazy<Task<JupyterRun>>> _jupyter = new(StringComparer.Ordinal);

    public string RepoRoot { get; } = LocalFeed.FindRepoRoot(AppContext.BaseDirectory);
    public string Feed { get; }

    public FeedFixture()
    {
        Feed = LocalFeed.Ensure(RepoRoot);
    }

    public NotebookRunner Runner() => new() { PackageSources = new[] { Feed }, CellTimeout = TimeSpan.FromMinutes(5) };

    public string NotebookPath(string name) => Path.Combine(RepoRoot, "notebooks", name);

    /// <summary>notebooks/<paramref name="name"/> as the embedded runner executed it.</summary>
    public Task<NotebookRunResult> Executed(string name) =>
        _executed.GetOrAdd(name, n => new Lazy<Task<NotebookRunResult>>(() => Runner().RunAsync(NotebookPath(n)))).Value;

    /// <summary>notebooks/<paramref name="name"/> as Jupyter executed it with the .NET kernel (needs <see cref="RequiredTool.Jupyter"/>).</summary>
    internal Task<JupyterRun> ExecutedByJupyter(string name) =>
        _jupyter.GetOrAdd(name, n => new Lazy<Task<JupyterRun>>(() => Task.Run(() => JupyterRun.Execute(RepoRoot, Feed, n)))).Value;

    /// <summary>The notebooks in notebooks/, by file name in ordinal order.</summary>
    public static TheoryData<string> Notebooks()
    {
        string dir = Path.Combine(LocalFeed.FindRepoRoot(AppContext.BaseDirectory), "notebooks");
        var data = new TheoryData<string>();
        foreach (var file in Directory.EnumerateFiles(dir, "*.ipynb").OrderBy(f => f, StringComparer.Ordinal))
            data.Add(Path.GetFileName(file));
        return data;
    }
}

[CollectionDefinition(Name)]
public sealed class FeedCollection : ICollectionFixture<FeedFixture>
{
    public const string Name = "package feed";
}
