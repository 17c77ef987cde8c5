using Kit.Common;
using Kit.Experiments;
using Kit.Training;

namespace Kit.Views;

/// <summary>Where <see cref="RunWriter.Write"/> put a run's files.</summary>
public sealed record RunFiles(string Folder, string Bundle, string Metrics, string Timings, string Report)
{
    public override string ToString() => $"{Path.GetFileName(Bundle)}, {Path.GetFileName(Metrics)}, {Path.GetFileName(Timings)}, {Path.GetFileName(Report)} in {Folder}";
}

/// <summary>
/// Writes the outputs of one run into a folder — the model bundle, metrics.json (numbers only, comparable byte for
/// byte between runs), timings.json and report.html — the same way for <c>kit train</c>, <c>kit demo</c> and a
/// notebook. Each file is written atomically, so a kill never leaves a torn file.
/// </summary>
public static class RunWriter
{
    public static RunFiles Write(string folder, RunReport report)
    {
        ArgumentNullException.ThrowIfNull(report);
        Directory.CreateDirectory(folder);
        var run = report.Run;
        var d = report.Diagnostics;
        var files = new RunFiles(folder, Path.Combine(folder, ModelBundle.DefaultFileName), Path.Combine(folder, "metrics.json"),
            Path.Combine(folder, "timings.json"), Path.Combine(folder, "report.html"));
        RunBundle.Of(run, d.Temperature.Temperature).Save(files.Bundle);
        AtomicFile.WriteAllText(files.Metrics, RunMetricsJson.Metrics(run, d));
        AtomicFile.WriteAllText(files.Timings, RunMetricsJson.Timings(run));
        report.Write(files.Report);
        return files;
    }
}
