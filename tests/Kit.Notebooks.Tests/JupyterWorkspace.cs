namespace Kit.Notebooks.Tests;

/// <summary>
/// A throw-away copy of one repository notebook laid out as in the repository (notebooks/NAME beside a link to
/// data-demo/, so ../data-demo paths hold), with a NuGet.Config in the notebook's folder that makes the packed
/// feed a package source for this copy only. The kernel restores packages with the notebook's folder as its
/// working directory, so this file applies to it and to nothing else; the user's own NuGet configuration is
/// neither read for sources (&lt;clear/&gt;) nor changed. Source mapping sends Kit and Kit.Notebooks to the
/// feed alone, so a package of the same name elsewhere can never be picked instead.
/// </summary>
internal sealed class JupyterWorkspace : IDisposable
{
    public string Root { get; }
    public string Notebook { get; }
    public string Executed { get; }

    JupyterWorkspace(string root, string notebook)
    {
        Root = root;
        Notebook = notebook;
        Executed = Path.ChangeExtension(notebook, ".executed.ipynb");
    }

    public static JupyterWorkspace Create(string repoRoot, string feed, string name)
    {
        string root = Directory.CreateTempSubdirectory("kit-jupyter-").FullName;
        string folder = Directory.CreateDirectory(Path.Combine(root, "notebooks")).FullName;
        Directory.CreateSymbolicLink(Path.Combine(root, "data-demo"), Path.Combine(repoRoot, "data-demo"));
        string notebook = Path.Combine(folder, name);
        File.Copy(Path.Combine(repoRoot, "notebooks", name), notebook);
        File.WriteAllText(Path.Combine(folder, "NuGet.Config"), NuGetConfig(feed));
        return new JupyterWorkspace(root, notebook);
    }

    public static string NuGetConfig(string feed) => $"""
        <?xml version="1.0" encoding="utf-8"?>
        <configuration>
          <packageSources>
            <clear />
            <add key="kit-under-test" value="{System.Security.SecurityElement.Escape(feed)}" />
            <add key="nuget.org" value="https://api.nuget.org/v3/index.json" protocolVersion="3" />
          </packageSources>
          <packageSourceMapping>
            <packageSource key="kit-under-test">
              <package pattern="Kit" />
              <package pattern="Kit.Notebooks" />
            </packageSource>
            <packageSource key="nuget.org">
              <package pattern="*" />
            </packageSource>
          </packageSourceMapping>
        </configuration>
        """;

    public void Dispose()
    {
        try
        {
            // Remove the link itself first, so nothing can follow it into the repository's data.
            var link = new DirectoryInfo(Path.Combine(Root, "data-demo"));
            if (link.LinkTarget is not null) link.Delete();
            Directory.Delete(Root, recursive: true);
        }
        catch (IOException) { }
    }
}
