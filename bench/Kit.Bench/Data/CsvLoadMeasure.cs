using Kit.Common;
using System.Diagnostics;
using System.Globalization;
using System.Text;
using Kit.Data;

namespace Kit.Bench.Data;

/// <summary>
/// Loads a generated 1M-row CSV of short texts (written to a temp folder at run time, deleted afterwards):
/// wall time and peak resident memory of <see cref="TableReader.Read"/>, the memory the table keeps, the
/// time against an unchecked File.ReadAllLines + string.Split of the same file (same run, interleaved), and
/// the time to encode all rows at character level.
/// </summary>
public sealed class CsvLoadMeasure : IMeasure
{
    public const int Rows = 1_000_000;
    public IReadOnlyList<string> Ids { get; } =
        ["csv-1m-load-seconds", "csv-1m-load-warm-seconds", "csv-1m-load-peak-mb", "csv-1m-table-mb", "csv-1m-load-vs-naive-split", "csv-1m-encode-seconds"];

    public IEnumerable<Figure> Run()
    {
        var dir = Directory.CreateTempSubdirectory("kit-bench-csv-");
        try
        {
            var path = Path.Combine(dir.FullName, "rows.csv");
            long bytes = Generate(path);
            var spec = new ColumnSpec(Group: "group");
            string file = $"{Rows:N0} rows, {bytes / 1e6:F0} MB, text/label/group, 8% quoted fields";

            Settle();
            ResetPeakResident();
            long before = GC.GetTotalMemory(true);
            var clock = Stopwatch.StartNew();
            LabelledTable? table = TableReader.Read(path, spec);
            double first = clock.Elapsed.TotalSeconds;
            double peakMb = PeakResidentMb();
            double tableMb = (GC.GetTotalMemory(true) - before) / 1e6;
            if (table.Count != Rows) throw new InvalidOperationException($"read {table.Count} rows, expected {Rows}");

            clock.Restart();
            var labels = table.LabelIds();
            var tokenizer = new CharacterTokenizer();
            var vocab = Vocabulary.Build(table.Texts.Select(tokenizer.Split));
            var (set, _) = Kit.Data.Encoder.Encode(table.Texts, labels, tokenizer, vocab, 64, TruncationPolicy.KeepHead);
            double encode = clock.Elapsed.TotalSeconds;
            GC.KeepAlive(set);
            table = null;

            var kit = new List<double> { first };
            var naive = new List<double>();
            for (int round = 0; round < 2; round++)
            {
                Settle();
                clock.Restart();
                int n = NaiveSplit(path);
                naive.Add(clock.Elapsed.TotalSeconds);
                if (n != Rows) throw new InvalidOperationException($"naive split saw {n} rows");
                Settle();
                clock.Restart();
                GC.KeepAlive(TableReader.Read(path, spec));
                kit.Add(clock.Elapsed.TotalSeconds);
            }
            yield return new Figure("csv-1m-load-seconds", first, "s", "≤ 10 s",
                $"first TableReader.Read in the process (cold: JIT, heap growth), as a user meets it; {file}");
            yield return new Figure("csv-1m-load-warm-seconds", kit.Skip(1).Min(), "s", "orientation",
                $"best of {kit.Count - 1} later TableReader.Read calls of the same file in the same process");
            yield return new Figure("csv-1m-load-peak-mb", peakMb, "MB", "≤ 1000 MB",
                "peak resident set (VmHWM, reset via /proc/self/clear_refs before the first load) of the whole bench process");
            yield return new Figure("csv-1m-table-mb", tableMb, "MB", "orientation",
                "managed heap kept by the loaded LabelledTable (GC.GetTotalMemory after full collections)");
            yield return new Figure("csv-1m-load-vs-naive-split", kit.Skip(1).Min() / naive.Min(), "×", "orientation (cost of RFC 4180 + UTF-8 checks)",
                "best later TableReader.Read over best File.ReadAllLines + string.Split(',') of the same file, interleaved in one run");
            yield return new Figure("csv-1m-encode-seconds", encode, "s", "orientation",
                "label ids + character vocabulary + Encoder.Encode (max length 64) of all 1M rows");
        }
        finally
        {
            dir.Delete(recursive: true);
        }
    }

    /// <summary>Short hostname-like texts from a seeded generator; some quoted with a comma or a doubled quote inside.</summary>
    static long Generate(string path)
    {
        var rng = new SplitMix64(1_000_000);
        const string letters = "abcdefghijklmnopqrstuvwxyz0123456789-.";
        string[] classes = ["alpha", "bravo", "charlie", "delta", "echo", "foxtrot"];
        using (var w = new StreamWriter(path, false, new UTF8Encoding(false), 1 << 16))
        {
            w.Write("text,label,group\n");
            var sb = new StringBuilder(40);
            for (int i = 0; i < Rows; i++)
            {
                sb.Clear();
                int len = 5 + rng.NextInt(26);
                for (int k = 0; k < len; k++) sb.Append(letters[rng.NextInt(letters.Length)]);
                int roll = rng.NextInt(100);
                if (roll < 5) w.Write($"\"{sb},x\"");
                else if (roll < 8) w.Write($"\"{sb}\"\"q\"");
                else w.Write(sb);
                w.Write(',');
                w.Write(classes[rng.NextInt(classes.Length)]);
                w.Write(",g");
                w.Write(rng.NextInt(50_000).ToString(CultureInfo.InvariantCulture));
                w.Write('\n');
            }
        }
        return new FileInfo(path).Length;
    }

    static int NaiveSplit(string path)
    {
        int rows = 0;
        foreach (var line in File.ReadAllLines(path).Skip(1))
            if (line.Split(',').Length >= 3) rows++;
        return rows;
    }

    static void Settle()
    {
        GC.Collect(2, GCCollectionMode.Forced, blocking: true, compacting: true);
        GC.WaitForPendingFinalizers();
        GC.Collect();
    }

    /// <summary>Linux: writing 5 to clear_refs resets the peak resident set size (VmHWM) of this process.</summary>
    static void ResetPeakResident()
    {
        try { File.WriteAllText("/proc/self/clear_refs", "5"); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException) { }
    }

    static double PeakResidentMb()
    {
        try
        {
            var line = File.ReadLines("/proc/self/status").First(l => l.StartsWith("VmHWM:", StringComparison.Ordinal));
            return long.Parse(line.Split(' ', StringSplitOptions.RemoveEmptyEntries)[1], CultureInfo.InvariantCulture) / 1024.0;
        }
        catch (Exception e) when (e is IOException or InvalidOperationException)
        {
            return Process.GetCurrentProcess().PeakWorkingSet64 / 1e6;
        }
    }
}
