namespace Kit.Data;

/// <summary>
/// Bad input, located: the message is always <c>FILE:LINE[:COL]: problem</c> so editors and terminals can jump
/// to it. Line 0 means the problem belongs to the whole source (e.g. a missing column in a DataFrame).
/// </summary>
public sealed class DataError : Exception
{
    public string File { get; }
    public int Line { get; }
    public int? Column { get; }
    public string Problem { get; }

    public DataError(string file, int line, int? column, string problem, Exception? inner = null)
        : base(Format(file, line, column, problem), inner)
    {
        File = file;
        Line = line;
        Column = column;
        Problem = problem;
    }

    public DataError(string file, int line, string problem) : this(file, line, null, problem) { }

    static string Format(string file, int line, int? column, string problem) =>
        column is int c ? $"{file}:{line}:{c}: {problem}" : $"{file}:{line}: {problem}";
}
