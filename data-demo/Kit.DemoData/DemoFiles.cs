using System.Text;

namespace Kit.DemoData;

public sealed record DemoRow(string Text, string Label, string Group);

/// <summary>Writes the demo files: UTF-8 without BOM, LF line ends, RFC 4180 quoting where needed.</summary>
public static class DemoFiles
{
    public const string Hostnames = "hostnames.csv";
    public const string MaintenanceNotes = "maintenance-notes.csv";

    public static IReadOnlyList<string> WriteAll(string directory)
    {
        Directory.CreateDirectory(directory);
        var written = new List<string>();
        foreach (var (name, rows) in All())
        {
            string path = Path.Combine(directory, name);
            File.WriteAllBytes(path, ToCsv(rows));
            written.Add(path);
        }
        return written;
    }

    public static IEnumerable<(string Name, IEnumerable<DemoRow> Rows)> All()
    {
        yield return (Hostnames, HostnameGenerator.Generate());
        yield return (MaintenanceNotes, MaintenanceNoteGenerator.Generate());
    }

    public static byte[] ToCsv(IEnumerable<DemoRow> rows)
    {
        var sb = new StringBuilder("text,label,group\n");
        foreach (var r in rows)
            sb.Append(Field(r.Text)).Append(',').Append(Field(r.Label)).Append(',').Append(Field(r.Group)).Append('\n');
        return new UTF8Encoding(false).GetBytes(sb.ToString());
    }

    static string Field(string s) =>
        s.IndexOfAny(new[] { ',', '"', '\n', '\r' }) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
}
