using System.Globalization;
using System.Text;

namespace Kit.Bench;

/// <summary>
/// `dotnet run --project bench/Kit.Bench -c Release -- [ids…]`: runs the named measures (all when none), prints
/// `BENCH id value unit` per figure and rewrites docs/benchmarks.md.
/// </summary>
public static class Program
{
    public static int Main(string[] args)
    {
        string? docsArg = null;
        var wanted = new HashSet<string>();
        for (int i = 0; i < args.Length; i++)
        {
            if (args[i] == "--docs" && i + 1 < args.Length) docsArg = args[++i];
            else if (!args[i].StartsWith("--", StringComparison.Ordinal)) wanted.Add(args[i]);
        }
        string docs = docsArg ?? FindDocs();
        var measures = MeasureCatalog.All().Where(m => wanted.Count == 0 || m.Ids.Any(wanted.Contains)).ToList();
        var unknown = wanted.Where(w => !MeasureCatalog.All().Any(m => m.Ids.Contains(w))).ToList();
        if (unknown.Count > 0)
        {
            Console.Error.WriteLine($"unknown measure id(s): {string.Join(", ", unknown)}; known: {string.Join(", ", MeasureCatalog.All().SelectMany(m => m.Ids))}");
            return 2;
        }
        var figures = new List<Figure>();
        foreach (var m in measures)
            foreach (var f in m.Run())
            {
                if (wanted.Count > 0 && !wanted.Contains(f.Id)) continue;
                figures.Add(f);
                Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"BENCH {f.Id} {f.Value:G6} {f.Unit}"));
            }
        BenchReport.Write(docs, figures);
        Console.WriteLine($"wrote {docs}");
        return 0;
    }

    static string FindDocs()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Kit.sln"))) dir = dir.Parent;
        return Path.Combine(dir?.FullName ?? ".", "docs", "benchmarks.md");
    }
}

/// <summary>Rewrites docs/benchmarks.md, keeping the rows of measures not run this time.</summary>
public static class BenchReport
{
    const string Begin = "<!-- figures: begin -->";
    const string End = "<!-- figures: end -->";

    public static void Write(string path, IReadOnlyList<Figure> figures)
    {
        var rows = new SortedDictionary<string, string>(StringComparer.Ordinal);
        string after = "";
        if (File.Exists(path))
        {
            var old = File.ReadAllText(path);
            int a = old.IndexOf(Begin, StringComparison.Ordinal), b = old.IndexOf(End, StringComparison.Ordinal);
            if (a >= 0 && b > a)
            {
                foreach (var line in old[(a + Begin.Length)..b].Split('\n'))
                    if (line.StartsWith("| `", StringComparison.Ordinal))
                        rows[line.Split('`')[1]] = line;
                // Hand-written sections below the table (e.g. the open-data check) are kept as they are.
                after = old[(b + End.Length)..].TrimStart('\r', '\n');
            }
        }
        string when = DateTime.UtcNow.ToString("yyyy-MM-dd HH:mm 'UTC'", CultureInfo.InvariantCulture);
        foreach (var f in figures)
            rows[f.Id] = string.Create(CultureInfo.InvariantCulture,
                $"| `{f.Id}` | {f.Value:G4} {f.Unit} | {f.Goal} | {when} | {f.HowMeasured.Replace("|", "/")} |");

        var sb = new StringBuilder();
        sb.AppendLine("# Benchmarks");
        sb.AppendLine();
        sb.AppendLine("Written by `dotnet run --project bench/Kit.Bench -c Release -- [ids…]`. Every ratio compares two");
        sb.AppendLine("things measured in the same process run (these machines are noisy); absolute times are for orientation.");
        sb.AppendLine();
        sb.AppendLine($"Last run: {when} on {Environment.ProcessorCount} cores, {CpuName()}, {Environment.OSVersion}, .NET {Environment.Version}.");
        sb.AppendLine();
        sb.AppendLine("| id | figure | goal | measured | how |");
        sb.AppendLine("| --- | --- | --- | --- | --- |");
        sb.AppendLine(Begin);
        foreach (var r in rows.Values) sb.AppendLine(r);
        sb.AppendLine(End);
        if (after.Length > 0) sb.AppendLine().Append(after);
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        File.WriteAllText(path, sb.ToString());
    }

    static string CpuName()
    {
        try
        {
            var line = File.ReadLines("/proc/cpuinfo").FirstOrDefault(l => l.StartsWith("model name", StringComparison.Ordinal));
            return line?.Split(':', 2)[1].Trim() ?? "unknown CPU";
        }
        catch (IOException) { return "unknown CPU"; }
    }
}
