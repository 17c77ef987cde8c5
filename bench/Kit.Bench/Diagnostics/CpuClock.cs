using System.Diagnostics;

namespace Kit.Bench.Diagnostics;

/// <summary>Wall and process CPU time of one action, and the machine's load for the record.</summary>
internal static class CpuClock
{
    public static (double WallSeconds, double CpuSeconds) Time(Action action)
    {
        var process = Process.GetCurrentProcess();
        process.Refresh();
        var cpu0 = process.TotalProcessorTime;
        var clock = Stopwatch.StartNew();
        action();
        double wall = clock.Elapsed.TotalSeconds;
        process.Refresh();
        return (wall, (process.TotalProcessorTime - cpu0).TotalSeconds);
    }

    public static string LoadAverage()
    {
        try { return File.ReadAllText("/proc/loadavg").Split(' ')[0]; }
        catch (IOException) { return "unknown"; }
    }
}
