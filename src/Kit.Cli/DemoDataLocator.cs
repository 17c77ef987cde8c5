namespace Kit.Cli;

/// <summary>Finds the data-demo folder from the current directory upwards (the CLI runs from anywhere in the repo).</summary>
internal static class DemoDataLocator
{
    public static string Find()
    {
        for (var dir = new DirectoryInfo(Environment.CurrentDirectory); dir is not null; dir = dir.Parent)
        {
            string candidate = Path.Combine(dir.FullName, "data-demo");
            if (File.Exists(Path.Combine(candidate, Kit.DemoData.DemoFiles.Hostnames))) return candidate;
        }
        throw new Kit.Data.DataError(Path.Combine(Environment.CurrentDirectory, "data-demo"), 0, null,
            "demo data not found here or in any parent folder; run `kit demo-data --out data-demo` or pass --data");
    }
}
