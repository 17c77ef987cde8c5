using Kit.Training;

namespace Kit.Cli;

/// <summary>A one-line progress bar on stderr (redrawn in place on a terminal, one line per epoch otherwise).</summary>
internal sealed class ConsoleProgress : IProgress<TrainingProgress>
{
    readonly bool _interactive = !Console.IsErrorRedirected;
    int _lastEpochPrinted;

    public void Report(TrainingProgress p)
    {
        const int width = 24;
        int filled = (int)Math.Round(width * p.Batch / (double)Math.Max(p.Batches, 1));
        string bar = new string('#', filled) + new string('.', width - filled);
        string val = p.ValidationAccuracy is double v ? $" val acc {v:P1}" : "";
        string line = $"epoch {p.Epoch}/{p.Epochs} [{bar}] batch {p.Batch}/{p.Batches} loss {p.Loss:F4}{val} eta {p.Eta:mm\\:ss}";
        if (_interactive) Console.Error.Write("\r" + line.PadRight(100));
        else if (p.Batch == p.Batches && p.Epoch != _lastEpochPrinted)
        {
            Console.Error.WriteLine(line);
            _lastEpochPrinted = p.Epoch;
        }
        if (_interactive && p.Batch == p.Batches) Console.Error.WriteLine();
    }
}
