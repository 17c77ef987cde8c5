namespace Kit.Tools.Notebooks;

public enum CellStatus { Passed, Failed, NotRun, Text }

/// <summary>One output of a cell. <see cref="Data"/> maps MIME type to value (text/plain, text/html, ...).</summary>
public sealed record CellOutput(string Kind, IReadOnlyDictionary<string, string> Data, string? ValueId = null)
{
    public const string Display = "display";
    public const string Result = "result";
    public const string StandardOutput = "stdout";
    public const string StandardError = "stderr";
    public const string Error = "error";

    public string? Html => Data.GetValueOrDefault("text/html");
    public string? Text => Data.GetValueOrDefault("text/plain");
}

/// <summary>What happened to one cell. <see cref="Number"/> is its 1-based position among all cells of the file.</summary>
public sealed record CellOutcome(
    int Number,
    string KernelName,
    string Source,
    CellStatus Status,
    IReadOnlyList<CellOutput> Outputs,
    TimeSpan Elapsed,
    string? Error = null);
