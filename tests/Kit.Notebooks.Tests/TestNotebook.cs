using System.Text.Json;
using System.Text.Json.Nodes;

namespace Kit.Notebooks.Tests;

/// <summary>Writes small nbformat 4 notebooks into a temp folder for runner tests. "md:" cells are markdown.</summary>
internal sealed class TestNotebook : IDisposable
{
    public string Folder { get; } = Directory.CreateTempSubdirectory("kit-nb-test-").FullName;

    public string Write(string name, params string[] cells)
    {
        var array = new JsonArray();
        foreach (var cell in cells)
        {
            bool markdown = cell.StartsWith("md:", StringComparison.Ordinal);
            var node = new JsonObject
            {
                ["cell_type"] = markdown ? "markdown" : "code",
                ["metadata"] = markdown ? new JsonObject() : new JsonObject { ["polyglot_notebook"] = new JsonObject { ["kernelName"] = "csharp" } },
                ["source"] = markdown ? cell[3..] : cell,
            };
            if (!markdown)
            {
                node["execution_count"] = null;
                node["outputs"] = new JsonArray();
            }
            array.Add(node);
        }
        var notebook = new JsonObject
        {
            ["cells"] = array,
            ["metadata"] = new JsonObject { ["kernelspec"] = new JsonObject { ["display_name"] = ".NET (C#)", ["language"] = "C#", ["name"] = ".net-csharp" } },
            ["nbformat"] = 4,
            ["nbformat_minor"] = 5,
        };
        string path = Path.Combine(Folder, name);
        File.WriteAllText(path, notebook.ToJsonString(new JsonSerializerOptions { WriteIndented = true }));
        return path;
    }

    public string WriteRaw(string name, string text)
    {
        string path = Path.Combine(Folder, name);
        File.WriteAllText(path, text);
        return path;
    }

    /// <summary>A first cell that references the kit's assemblies as built for this test run (no package feed).</summary>
    public static string ReferenceBuiltKit() =>
        $"#r \"{typeof(Kit.Views.IView).Assembly.Location}\"\n#r \"{typeof(LiveProgress).Assembly.Location}\"\n#r \"{typeof(TestNotebook).Assembly.Location}\"";

    public void Dispose()
    {
        try { Directory.Delete(Folder, recursive: true); } catch (IOException) { }
    }
}
