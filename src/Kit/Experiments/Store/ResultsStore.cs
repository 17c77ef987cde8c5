using System.Text;
using System.Text.Json;
using Kit.Common;
using Kit.Data;

namespace Kit.Experiments;

/// <summary>What a store folder holds: the finished runs (each once) and what reading it had to say.</summary>
public sealed record StoreContents(IReadOnlyList<RunRecord> Records, IReadOnlyList<string> Notes, IReadOnlyList<string> Files)
{
    public IReadOnlySet<string> FinishedIds => Records.Select(r => r.Id).ToHashSet(StringComparer.Ordinal);
}

/// <summary>
/// The results store of a sweep: a folder of JSON-lines files, <see cref="MainFile"/> for an unsharded sweep
/// (and for merged shards) and one runs.shard-I-of-N.jsonl per shard, plus <see cref="DefinitionFile"/>
/// describing the sweep so a folder is never silently reused for a different one.
/// </summary>
public static class ResultsStore
{
    public const string MainFile = "runs.jsonl";
    public const string DefinitionFile = "sweep.json";
    const string ShardPattern = "runs.shard-*-of-*.jsonl";

    public static IReadOnlyList<string> Files(string dir)
    {
        if (!Directory.Exists(dir)) return [];
        var files = Directory.GetFiles(dir, ShardPattern).Order(StringComparer.Ordinal).ToList();
        string main = Path.Combine(dir, MainFile);
        if (File.Exists(main)) files.Insert(0, main);
        return files;
    }

    /// <summary>
    /// Every finished run in the folder. A torn final line (no newline: the writer was killed mid-line) is left
    /// out and noted; any other line that is not a record is an error naming the file and line. A run found in
    /// two files (a shard file next to a merge that already holds it) is kept once and must agree.
    /// </summary>
    public static StoreContents Read(string dir)
    {
        var records = new Dictionary<string, RunRecord>(StringComparer.Ordinal);
        var order = new List<string>();
        var notes = new List<string>();
        var files = Files(dir);
        foreach (var file in files)
        {
            var text = Encoding.UTF8.GetString(File.ReadAllBytes(file));
            var lines = text.Split('\n');
            for (int i = 0; i < lines.Length; i++)
            {
                string line = lines[i];
                bool last = i == lines.Length - 1;
                if (line.Length == 0) { if (!last) throw new DataError(file, i + 1, null, "empty line in a results store"); continue; }
                if (last)
                {
                    notes.Add($"{file}:{i + 1}: torn final line ({Encoding.UTF8.GetByteCount(line)} bytes without a newline) ignored; the run it held will run again");
                    continue;
                }
                RunRecord record;
                try { record = RunRecord.FromJson(line); }
                catch (JsonException e) { throw new DataError(file, i + 1, null, $"not a run record: {e.Message}", e); }
                if (record.Version != RunRecord.FormatVersion)
                    throw new DataError(file, i + 1, null, $"record format {record.Version}; this kit reads format {RunRecord.FormatVersion}");
                if (records.TryGetValue(record.Id, out var seen))
                {
                    if (seen.ResultsJson() != record.ResultsJson())
                        throw new DataError(file, i + 1, null, $"run {record.Id} is stored twice with different results");
                    continue;
                }
                records[record.Id] = record;
                order.Add(record.Id);
            }
        }
        return new StoreContents(order.Select(id => records[id]).ToArray(), notes, files);
    }

    /// <summary>
    /// Writes every run of the folder into <see cref="MainFile"/> (atomically), then removes the shard files it
    /// took them from. Safe to run again, and safe to kill: until the new main file is in place nothing is removed.
    /// </summary>
    public static StoreContents Merge(string dir, IReadOnlyList<RunKey>? order = null)
    {
        var contents = Read(dir);
        var records = contents.Records.AsEnumerable();
        if (order is not null)
        {
            var position = order.Select((k, i) => (k.Id, i)).ToDictionary(p => p.Id, p => p.i, StringComparer.Ordinal);
            records = records.OrderBy(r => position.TryGetValue(r.Id, out int p) ? p : int.MaxValue);
        }
        var list = records.ToArray();
        var body = new StringBuilder();
        foreach (var r in list) body.Append(r.ToJsonLine()).Append('\n');
        string main = Path.Combine(dir, MainFile);
        AtomicFile.WriteAllText(main, body.ToString());
        foreach (var f in contents.Files.Where(f => !string.Equals(Path.GetFullPath(f), Path.GetFullPath(main), StringComparison.Ordinal)))
            File.Delete(f);
        return contents with { Records = list };
    }
}
