namespace Kit.Notebooks.Tests;

/// <summary>Files a test leaves for people and CI to look at: beside the test binaries, under TestResults/notebooks.</summary>
internal static class TestArtifacts
{
    public static string Folder(string? sub = null)
    {
        string dir = Path.Combine(AppContext.BaseDirectory, "TestResults", "notebooks", sub ?? "");
        Directory.CreateDirectory(dir);
        return dir;
    }
}
