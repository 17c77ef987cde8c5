using Kit.Tests.Experiments;

namespace Kit.Tests.Cluster;

/// <summary>
/// The code blocks of docs/cluster.md, read from the page itself so that what the tests submit is what users copy.
/// A block is found by the paragraph that introduces it: a line starting with its label (e.g. "`sweep.sbatch`")
/// and ending in ':', followed by a fenced block.
/// </summary>
internal static class ClusterPage
{
    public static string Path => System.IO.Path.Combine(KitCli.RepoRoot(), "docs", "cluster.md");

    public static string Block(string label)
    {
        var lines = File.ReadAllLines(Path);
        int intro = Array.FindIndex(lines, l => l.StartsWith(label, StringComparison.Ordinal) && l.TrimEnd().EndsWith(':'));
        if (intro < 0) throw new Xunit.Sdk.XunitException($"{Path}: no paragraph starting with {label} and ending in ':'");
        int open = Array.FindIndex(lines, intro + 1, l => l.StartsWith("```", StringComparison.Ordinal));
        if (open != intro + 2 || lines[intro + 1].Trim().Length != 0)
            throw new Xunit.Sdk.XunitException($"{Path}:{intro + 1}: {label} is not followed by a blank line and a code block");
        int close = Array.FindIndex(lines, open + 1, l => l.TrimEnd() == "```");
        if (close < 0) throw new Xunit.Sdk.XunitException($"{Path}:{open + 1}: code block after {label} is not closed");
        return string.Join('\n', lines[(open + 1)..close]) + "\n";
    }
}
