namespace Kit.Notebooks.Tests;

/// <summary>
/// Packs Kit and Kit.Notebooks into artifacts/feed once per test run, and only when their sources changed since
/// the last pack, so notebooks restore exactly the code under test.
/// </summary>
public sealed class FeedFixture
{
    public string RepoRoot { get; } = LocalFeed.FindRepoRoot(AppContext.BaseDirectory);
    public string Feed { get; }

    public FeedFixture()
    {
        Feed = LocalFeed.Ensure(RepoRoot);
    }

    public NotebookRunner Runner() => new() { PackageSources = new[] { Feed }, CellTimeout = TimeSpan.FromMinutes(5) };
}

[CollectionDefinition(Name)]
public sealed class FeedCollection : ICollectionFixture<FeedFixture>
{
    public const string Name = "package feed";
}
