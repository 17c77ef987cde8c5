using System.Text;

namespace Kit.Tests.Experiments;

/// <summary>
/// Two part-of-speech tasks made from Princeton WordNet 3.0 (Miller 1995, "WordNet: A Lexical Database for English",
/// Communications of the ACM 38(11); Fellbaum (ed.) 1998, "WordNet: An Electronic Lexical Database", MIT Press), as
/// the Debian package wordnet-base carries it in /usr/share/wordnet (file format: the package's wndb(5WN) manual).
/// (a) gloss → part of speech: the definition text of every synset that is not an instance (a synset with an "@i"
/// instance-hypernym pointer names one thing, e.g. a person or place, and is left out); a gloss text shared by
/// synsets of two parts of speech has no single answer and is left out, and a repeated one is kept once.
/// (b) lemma → part of speech: single-word lemmas (no "_") listed in exactly one of the four index files.
/// Satellite adjectives ("s") count as adjectives. The WordNet licence asks that its notice go with every copy of the
/// database, so <see cref="WriteCsv"/> writes it beside each derived file.
/// </summary>
internal static class WordNetSets
{
    public static readonly string[] Parts = ["noun", "verb", "adjective", "adverb"];
    static readonly string[] Files = ["noun", "verb", "adj", "adv"];

    public const string Install = "apt-get install wordnet-base (Debian), or set KIT_WORDNET_DIR to a folder with WordNet 3.0's data.* and index.* files";

    /// <summary>The WordNet dictionary folder, or null when it is not installed.</summary>
    public static string? Folder()
    {
        string dir = Environment.GetEnvironmentVariable("KIT_WORDNET_DIR") is { Length: > 0 } d ? d : "/usr/share/wordnet";
        return Files.All(f => File.Exists(Path.Combine(dir, "data." + f)) && File.Exists(Path.Combine(dir, "index." + f))) ? dir : null;
    }

    /// <summary>The licence notice at the top of a WordNet data file (its lines start with two spaces and a line number).</summary>
    public static string Licence(string folder)
    {
        var lines = File.ReadLines(Path.Combine(folder, "data.adv"), Encoding.Latin1).TakeWhile(l => l.StartsWith("  ", StringComparison.Ordinal));
        return string.Join("\n", lines.Select(l => System.Text.RegularExpressions.Regex.Replace(l, @"^\s*\d+ ?", "").TrimEnd()));
    }

    public static List<(string Text, string Label)> Glosses(string folder) =>
        OneAnswer(Synsets(folder).Select(x => (x.Gloss, x.Part))).Select(x => (x.Text, Parts[x.Answer])).ToList();

    /// <summary>Every non-instance synset of the four data files: its part of speech, lexicographer file and gloss, in file order.</summary>
    static IEnumerable<(int Part, int File, string Gloss)> Synsets(string folder)
    {
        for (int p = 0; p < Files.Length; p++)
            foreach (var line in File.ReadLines(Path.Combine(folder, "data." + Files[p]), Encoding.Latin1))
            {
                if (line.StartsWith("  ", StringComparison.Ordinal)) continue;
                int bar = line.IndexOf(" | ", StringComparison.Ordinal);
                if (bar < 0) throw new InvalidDataException($"{folder}/data.{Files[p]}: a synset line without a gloss: {line[..Math.Min(60, line.Length)]}");
                var fields = line[..bar].Split(' ');
                if (fields.Contains("@i")) continue;
                yield return (p, int.Parse(fields[1], System.Globalization.CultureInfo.InvariantCulture), line[(bar + 3)..].Trim());
            }
    }

    /// <summary>Each distinct text once, in first-seen order, keeping only texts that always carry the same answer.</summary>
    static IEnumerable<(string Text, int Answer)> OneAnswer(IEnumerable<(string Text, int Answer)> rows)
    {
        var answers = new Dictionary<string, HashSet<int>>(StringComparer.Ordinal);
        var order = new List<string>();
        foreach (var (text, answer) in rows)
        {
            if (!answers.TryGetValue(text, out var set)) { answers[text] = set = []; order.Add(text); }
            set.Add(answer);
        }
        return order.Where(t => answers[t].Count == 1).Select(t => (t, answers[t].Single()));
    }

    /// <summary>
    /// (c) gloss → lexicographer file: the 45 semantic files WordNet's synsets are filed under (noun.artifact,
    /// verb.motion, adj.all …; the lex_filenum field of each data-file line, wndb(5WN)), non-instance synsets only,
    /// a gloss text filed under two files left out. Names come from the package's lexnames(5WN) manual page when it is
    /// installed, otherwise the files are named by number.
    /// </summary>
    public static List<(string Text, string Label)> GlossesByFile(string folder)
    {
        var names = LexicographerFileNames();
        return OneAnswer(Synsets(folder).Select(x => (x.Gloss, x.File)))
            .Select(x => (x.Text, names.TryGetValue(x.Answer, out var n) ? n : $"lexfile-{x.Answer:D2}")).ToList();
    }

    /// <summary>Number → name of WordNet's lexicographer files, read from Debian's lexnames(5WN) page (empty when absent).</summary>
    static Dictionary<int, string> LexicographerFileNames()
    {
        var names = new Dictionary<int, string>();
        const string page = "/usr/share/man/man5/lexnames.5WN.gz";
        if (!File.Exists(page)) return names;
        using var gz = new System.IO.Compression.GZipStream(File.OpenRead(page), System.IO.Compression.CompressionMode.Decompress);
        using var reader = new StreamReader(gz, Encoding.Latin1);
        while (reader.ReadLine() is { } line)
        {
            var m = System.Text.RegularExpressions.Regex.Match(line, @"^(\d\d)\t(\S+)\s");
            if (m.Success) names[int.Parse(m.Groups[1].Value, System.Globalization.CultureInfo.InvariantCulture)] = m.Groups[2].Value;
        }
        return names;
    }

    public static List<(string Text, string Label)> Lemmas(string folder) =>
        OneAnswer(IndexLemmas(folder)).Select(x => (x.Text, Parts[x.Answer])).ToList();

    /// <summary>Single-word lemmas of the four index files with the part of speech of the file, in file order.</summary>
    static IEnumerable<(string Lemma, int Part)> IndexLemmas(string folder)
    {
        for (int p = 0; p < Files.Length; p++)
            foreach (var line in File.ReadLines(Path.Combine(folder, "index." + Files[p]), Encoding.Latin1))
            {
                if (line.StartsWith("  ", StringComparison.Ordinal)) continue;
                string lemma = line[..line.IndexOf(' ')];
                if (!lemma.Contains('_')) yield return (lemma, p);
            }
    }

    /// <summary>Writes text,label rows as CSV (quoted where needed) and the WordNet licence beside it.</summary>
    public static string WriteCsv(IEnumerable<(string Text, string Label)> rows, string path, string folder)
    {
        var sb = new StringBuilder("text,label\n");
        foreach (var (text, label) in rows)
            sb.Append(text.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + text.Replace("\"", "\"\"") + "\"" : text).Append(',').Append(label).Append('\n');
        File.WriteAllText(path, sb.ToString());
        File.WriteAllText(Path.ChangeExtension(path, ".LICENSE.txt"),
            "Derived from Princeton WordNet 3.0 (Debian package wordnet-base). Its licence:\n\n" + Licence(folder) + "\n");
        return path;
    }
}
