using System.Globalization;
using Kit.Training;

namespace Kit.Cli;

/// <summary>One progress line on stderr: redrawn in place on a terminal, one line per finished epoch otherwise.</summary>
internal sealed class ConsoleProgress : IProgress<TrainingProgress>
{
    readonly bool _interactive = !Console.IsErrorRedirected;
    int _lastEpochPrinted;

    public void Report(TrainingProgress p)
    {
        string line = Line(p);
        if (_interactive) Console.Error.Write("\r" + line.PadRight(100));
        else if (p.Batch == p.Batches && p.Epoch != _lastEpochPrinted)
        {
            Console.Error.WriteLine(line);
            _lastEpochPrinted = p.Epoch;
        }
        if (_interactive && p.Batch == p.Batches) Console.Error.WriteLine();
    }

    /// <summary>Plain words and commas, so the line reads the same in a log file as on a terminal.</summary>
    internal static string Line(TrainingProgress p)
    {
        var inv = CultureInfo.InvariantCulture;
        int share = (int)Math.Round(100.0 * p.Batch / Math.Max(p.Batches, 1));
        string val = p.ValidationAccuracy is double v ? $", val acc {(100 * v).ToString("F1", inv)} %" : "";
        return $"epoch {p.Epoch} of {p.Epochs}, batch {p.Batch} of {p.Batches} ({share} %), loss {p.Loss.ToString("F4", inv)}{val}, left {Left(p.Eta)}";
    }

    /// <summary>m:ss under an hour, h:mm:ss beyond.</summary>
    internal static string Left(TimeSpan t)
    {
        if (t < TimeSpan.Zero) t = TimeSpan.Zero;
        var inv = CultureInfo.InvariantCulture;
        return t.TotalHours >= 1
            ? string.Create(inv, $"{(int)t.TotalHours}:{t.Minutes:00}:{t.Seconds:00}")
            : string.Create(inv, $"{(int)t.TotalMinutes}:{t.Seconds:00}");
    }
}
