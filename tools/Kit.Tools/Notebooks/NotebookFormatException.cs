namespace Kit.Tools.Notebooks;

/// <summary>A notebook file that cannot be run: missing, not JSON, or not nbformat 4. The message names the file.</summary>
public sealed class NotebookFormatException(string path, string problem, long? line = null)
    : Exception(line is { } l ? $"{path}:{l}: {problem}" : $"{path}: {problem}")
{
    public string Path { get; } = path;
    public string Problem { get; } = problem;
    public long? Line { get; } = line;
}
