using Kit.Data;

namespace Kit.Bench.Batching;

/// <summary>
/// The demo hostnames as a character-level <see cref="EncodedSet"/>, read with a local split so the bench does
/// not depend on the data layer. The file's text column holds no quotes or commas (the generator never writes
/// them); any line that is not exactly three fields is an error naming the line.
/// </summary>
internal static class DemoHostnames
{
    public static EncodedSet Load()
    {
        string path = Path.Combine(RepoRoot(), "data-demo", "hostnames.csv");
        var texts = new List<string>();
        var labels = new List<string>();
        int lineNumber = 0;
        foreach (var line in File.ReadLines(path))
        {
            lineNumber++;
            if (lineNumber == 1)
            {
                if (line != "text,label,group") throw new FormatException($"{path}:1: expected header 'text,label,group', found '{line}'");
                continue;
            }
            var fields = line.Split(',');
            if (fields.Length != 3) throw new FormatException($"{path}:{lineNumber}: expected 3 fields, found {fields.Length}");
            if (fields[0].Length == 0) throw new FormatException($"{path}:{lineNumber}: empty text");
            texts.Add(fields[0]);
            labels.Add(fields[1]);
        }
        // Ids 0 and 1 are pad and unknown; characters take 2.. in sorted order.
        var alphabet = texts.SelectMany(t => t).Distinct().Order().Select((c, i) => (c, i)).ToDictionary(p => p.c, p => p.i + 2);
        var classes = labels.Distinct().Order(StringComparer.Ordinal).Select((l, i) => (l, i)).ToDictionary(p => p.l, p => p.i);
        var set = EncodedSet.FromSequences(texts.Select(t => t.Select(c => alphabet[c]).ToArray()).ToList(), labels.Select(l => classes[l]).ToList());
        VocabularySize = alphabet.Count + 2;
        Classes = classes.Count;
        return set;
    }

    public static int VocabularySize { get; private set; }
    public static int Classes { get; private set; }

    static string RepoRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Kit.sln"))) dir = dir.Parent;
        return dir?.FullName ?? throw new DirectoryNotFoundException($"no Kit.sln above {AppContext.BaseDirectory}");
    }
}
