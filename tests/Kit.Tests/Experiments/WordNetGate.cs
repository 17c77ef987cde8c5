using Xunit.Abstractions;

namespace Kit.Tests.Experiments;

/// <summary>
/// Whether a test may use WordNet 3.0 (<see cref="WordNetSets"/>): its folder, or null after writing an install hint
/// as the test's skip reason — and a failure instead when KIT_REQUIRE_OPEN_DATA=1 (.ci/run sets it), so a CI machine
/// that should have the data cannot pass quietly.
/// </summary>
internal static class WordNetGate
{
    public const string RequireVariable = "KIT_REQUIRE_OPEN_DATA";

    public static string? FolderOrSkip(ITestOutputHelper output)
    {
        if (WordNetSets.Folder() is { } folder) return folder;
        string how = $"WordNet 3.0 not found. Install: {WordNetSets.Install}. Set {RequireVariable}=1 to make this a failure.";
        Assert.False(Environment.GetEnvironmentVariable(RequireVariable) == "1", how);
        output.WriteLine("skipped: " + how);
        return null;
    }
}
