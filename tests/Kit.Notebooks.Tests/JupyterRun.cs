using System.Text.Json.Nodes;

namespace Kit.Notebooks.Tests;

/// <summary>One repository notebook executed by Jupyter (nbconvert) with the .NET kernel; the executed file is kept as a test artifact.</summary>
internal sealed record JupyterRun(string Name, JupyterClient.Result Result, string? ExecutedCopy)
{
    public JsonNode Executed => JsonNode.Parse(File.ReadAllText(ExecutedCopy ?? throw new InvalidOperationException($"{Name}: Jupyter wrote no executed notebook")))!;

    public static JupyterRun Execute(string repoRoot, string feed, string name)
    {
        using var workspace = JupyterWorkspace.Create(repoRoot, feed, name);
        var result = JupyterClient.Execute(workspace.Notebook, workspace.Executed, cellTimeout: TimeSpan.FromMinutes(5), totalTimeout: TimeSpan.FromMinutes(8));
        string? kept = null;
        if (File.Exists(workspace.Executed))
        {
            kept = Path.Combine(TestArtifacts.Folder("jupyter"), Path.GetFileName(workspace.Executed));
            File.Copy(workspace.Executed, kept, overwrite: true);
        }
        return new JupyterRun(name, result, kept);
    }
}
