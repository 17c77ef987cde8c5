namespace Kit.Experiments;

/// <summary>
/// The worker side of <see cref="ProcessWorker"/>: reads run ids, one per line, until its input ends, and answers
/// each with the finished record. A failed run is answered with an error line; the worker carries on.
/// </summary>
internal static class SweepWorker
{
    public static int Serve(Sweep sweep, TextReader input, TextWriter output, TextWriter log)
    {
        var runs = sweep.Plan.Runs().ToDictionary(k => k.Id, StringComparer.Ordinal);
        string? line;
        while ((line = input.ReadLine()) is not null)
        {
            if (line.Length == 0) continue;
            string answer;
            try
            {
                if (!runs.TryGetValue(line, out var key)) throw new ArgumentException($"'{line}' is not a run of this sweep");
                answer = ProcessWorker.ResultPrefix + sweep.Execute(key).ToJsonLine();
            }
            catch (Exception e) when (e is not OutOfMemoryException)
            {
                log.WriteLine($"worker: run {line} failed: {e}");
                answer = ProcessWorker.ErrorPrefix + e.Message.ReplaceLineEndings(" ");
            }
            output.WriteLine(answer);
            output.Flush();
        }
        return 0;
    }
}
