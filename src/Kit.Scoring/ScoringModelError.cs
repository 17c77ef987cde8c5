namespace Kit.Scoring;

/// <summary>A model file or side-car this library cannot use: names the file and the problem.</summary>
public sealed class ScoringModelError : Exception
{
    public string File { get; }
    public string Problem { get; }

    public ScoringModelError(string file, string problem, Exception? inner = null) : base($"{file}: {problem}", inner)
    {
        File = file;
        Problem = problem;
    }
}
