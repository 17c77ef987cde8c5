using System.CommandLine;
using System.Globalization;
using Kit.Data;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit inspect DATA`: the data profile, a default split's summary and the leakage audit, as plain text.
/// Bad input prints the located `FILE:LINE: problem` message and exits with 2.
/// </summary>
internal static class InspectCommand
{
    public const int BadInput = 2;

    internal sealed record Settings(string Path, ColumnSpec Columns, string Tokenizer, RowPolicy Policy, ulong Seed);

    public static Command Build()
    {
        var data = new Argument<string>("DATA") { Description = "A .csv, .tsv/.tab or .jsonl/.ndjson file with a header (or keys) naming its columns" };
        var text = new Option<string>("--text") { Description = "Column holding the text", DefaultValueFactory = _ => "text" };
        var label = new Option<string>("--label") { Description = "Column holding the class label", DefaultValueFactory = _ => "label" };
        var group = new Option<string?>("--group") { Description = "Column of group keys that must not be split across parts" };
        var split = new Option<string?>("--split") { Description = "Column that already assigns rows to train / validation / test" };
        var tokenizer = new Option<string>("--tokenizer") { Description = "character, character-folded, byte, word or word-lower", DefaultValueFactory = _ => "character" };
        var skip = new Option<bool>("--skip-bad-rows") { Description = "Drop unusable rows and report them, instead of stopping at the first" };
        var seed = new Option<ulong>("--seed") { Description = "Seed of the default split", DefaultValueFactory = _ => 1UL };
        var command = new Command("inspect", "Profile a labelled data file, summarise a default split and audit it for leakage.")
        {
            data, text, label, group, split, tokenizer, skip, seed,
        };
        command.SetAction(parse => Run(new Settings(parse.GetValue(data)!,
            new ColumnSpec(parse.GetValue(text)!, parse.GetValue(label)!, parse.GetValue(group), parse.GetValue(split)),
            parse.GetValue(tokenizer)!, parse.GetValue(skip) ? RowPolicy.Skip : RowPolicy.Refuse, parse.GetValue(seed)),
            Console.Out, Console.Error));
        return command;
    }

    internal static int Run(Settings settings, TextWriter output, TextWriter errors)
    {
        ITokenizer tokenizer;
        switch (settings.Tokenizer)
        {
            case "character": tokenizer = new CharacterTokenizer(); break;
            case "character-folded": tokenizer = new CharacterTokenizer(foldCase: true); break;
            case "byte": tokenizer = new ByteTokenizer(); break;
            case "word": tokenizer = new WordTokenizer(lowerCase: false); break;
            case "word-lower": tokenizer = new WordTokenizer(); break;
            default:
                errors.WriteLine($"unknown tokenizer '{settings.Tokenizer}' (character, character-folded, byte, word, word-lower)");
                return 1;
        }
        try
        {
            var table = TableReader.Read(settings.Path, settings.Columns, settings.Policy);
            Write(output, table, tokenizer, settings.Seed);
            return 0;
        }
        catch (DataError e)
        {
            errors.WriteLine(e.Message);
            return BadInput;
        }
    }

    static void Write(TextWriter o, LabelledTable table, ITokenizer tokenizer, ulong seed)
    {
        var profile = DatasetProfile.Compute(table, tokenizer);
        var map = table.LabelMap();
        var labels = table.LabelIds(map);

        o.WriteLine($"{table.SourcePath}: {table.Count} rows, {map.Count} classes, tokenizer {tokenizer.Name}");
        if (!table.SkipReport.IsEmpty) o.WriteLine(table.SkipReport.ToString());
        o.WriteLine();
        o.WriteLine("Classes");
        Table(o, ["class", "rows", "share", "min len", "median", "p90", "max len"],
            profile.Classes.Select(c => new[] { c.Name, N(c.Rows), P(c.Proportion), N(c.Lengths.Min), F(c.Lengths.Median), F(c.Lengths.P90), N(c.Lengths.Max) }));
        o.WriteLine($"imbalance (largest / smallest class): {F(profile.ImbalanceRatio)}");
        o.WriteLine();
        o.WriteLine($"Lengths in tokens: min {profile.Lengths.Min}, median {F(profile.Lengths.Median)}, p90 {F(profile.Lengths.P90)}, p99 {F(profile.Lengths.P99)}, max {profile.Lengths.Max}");
        int widest = profile.Histogram.Max(b => b.Rows);
        foreach (var bin in profile.Histogram)
            o.WriteLine($"  {(bin.From == bin.To ? N(bin.From) : $"{bin.From}-{bin.To}"),9} {N(bin.Rows),8} {new string('#', (int)Math.Ceiling(40.0 * bin.Rows / widest))}");
        var cov = profile.Coverage;
        o.WriteLine($"Tokens: {cov.Occurrences} occurrences of {cov.Types} distinct tokens, {cov.Singletons} seen once; " +
                    $"the top {cov.TypesFor90} / {cov.TypesFor95} / {cov.TypesFor99} cover 90 / 95 / 99 %");
        o.WriteLine();

        var split = table.Splits is not null ? Splitter.FromColumn(table.Splits, labels, profile.RowLengths)
            : table.Groups is not null ? Splitter.GroupHoldout(labels, table.Groups.ToArray(), 0.8, 0.1, 0.1, seed, profile.RowLengths)
            : Splitter.StratifiedHoldout(labels, 0.8, 0.1, 0.1, seed, profile.RowLengths);
        string fractions = table.Splits is null ? " 80/10/10" : "";
        o.WriteLine($"Split: {split.Summary.Method}{fractions}" + (table.Splits is null ? $", seed {seed}" : ""));
        Table(o, new[] { "part", "rows", "median len" }.Concat(map.Names).ToArray(),
            split.Summary.Parts.Select(p => new[] { p.Part, N(p.Rows), F(p.Lengths.Median) }
                .Concat(p.ClassCounts.Select((c, k) => $"{c} ({P(p.Proportions[k])})")).ToArray()));
        var vocab = Vocabulary.Build(split.Train.Select(r => tokenizer.Split(table.Texts[r])));
        o.WriteLine($"Vocabulary from train: {vocab.Count} ids; unknown rate " + string.Join(", ",
            Enumerable.Range(0, 3).Select(p => $"{Split.PartNames[p]} {P(vocab.Coverage(split.Rows(p).Select(r => tokenizer.Split(table.Texts[r]))).UnknownRate)}")));
        o.WriteLine();

        var audit = LeakageAudit.Run(table, split);
        o.WriteLine(audit.Clean ? "Leakage audit: nothing found" : "Leakage audit");
        foreach (var f in audit.Findings)
        {
            o.WriteLine($"  {f.Kind}: {f.Texts} distinct, {f.Rows} row(s)");
            foreach (var e in f.Examples)
                o.WriteLine($"    \"{Shorten(e.Text)}\" {Shorten(e.Detail)} (lines {string.Join(", ", e.Lines)})");
        }
    }

    static void Table(TextWriter o, string[] header, IEnumerable<string[]> rows)
    {
        var all = new[] { header }.Concat(rows).ToList();
        var widths = Enumerable.Range(0, header.Length).Select(c => all.Max(r => r[c].Length)).ToArray();
        foreach (var row in all)
            o.WriteLine("  " + string.Join("  ", row.Select((cell, c) => c == 0 ? cell.PadRight(widths[c]) : cell.PadLeft(widths[c]))));
    }

    static string Shorten(string s)
    {
        s = s.Replace("\r", "\\r", StringComparison.Ordinal).Replace("\n", "\\n", StringComparison.Ordinal);
        return s.Length <= 80 ? s : s[..77] + "...";
    }

    static string N(int v) => v.ToString(CultureInfo.InvariantCulture);
    static string F(double v) => double.IsNaN(v) ? "-" : v.ToString("0.##", CultureInfo.InvariantCulture);
    static string P(double v) => (100 * v).ToString("0.0", CultureInfo.InvariantCulture) + "%";
}
