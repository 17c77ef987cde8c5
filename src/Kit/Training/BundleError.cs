namespace Kit.Training;

/// <summary>A model bundle or checkpoint that cannot be used; the message is always <c>FILE: problem</c>.</summary>
public sealed class BundleError : Exception
{
    public string File { get; }
    public string Problem { get; }

    public BundleError(string file, string problem, Exception? inner = null) : base($"{file}: {problem}", inner)
    {
        File = file;
        Problem = problem;
    }
}
