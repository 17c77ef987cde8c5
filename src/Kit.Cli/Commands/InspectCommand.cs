using System.CommandLine;
using System.Globalization;
using Kit.Data;
using Kit.Experiments;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit inspect DATA`: the data profile, the split's summary and the leakage audit, as plain text. The data is
/// prepared exactly as `kit train` and `kit compare` prepare it with the same flags (same defaults, same seed, the
/// split column when one is named), so the split audited here is the split trained on.
/// Bad input prints the located `FILE:LINE: problem` message and exits with 2.
/// </summary>
internal static class InspectCommand
{
    public const int BadInput = CliErrors.BadInput;

    internal sealed record Settings(RunSpec Spec, RowPolicy Policy, int? Folds = null);

    public static Command Build()
    {
        var data = new Argument<string>("DATA") { Description = "A .csv, .tsv/.tab or .jsonl/.ndjson file with a header (or keys) naming its columns" };
        var skip = new Option<bool>("--skip-bad-rows") { Description = "Drop unusable rows and report them, instead of stopping at the first" };
        var folds = new Option<int?>("--folds") { Description = "Audit a k-fold split (as kit compare --folds cuts it) instead of the holdout" };
        var command = new Command("inspect", "Profile a labelled data file, summarise its split and audit it for leakage.") { data };
        // The data settings only: the same flags, defaults and help text as train and compare.
        var shared = RunOptions.AddTo(command, s => s.Scope == SettingScope.Data);
        command.Options.Add(folds);
        command.Options.Add(skip);
        command.SetAction(parse =>
        {
            var errors = parse.InvocationConfiguration.Error;
            return CliErrors.Guard(() => Run(new Settings(shared.Read(parse, RunSettings.Defaults with { DataPath = parse.GetValue(data)! }),
                parse.GetValue(skip) ? RowPolicy.Skip : RowPolicy.Refuse, parse.GetValue(folds)), parse.InvocationConfiguration.Output, errors), errors);
        });
        return command;
    }

    internal static int Run(Settings settings, TextWriter output, TextWriter errors) => CliErrors.Guard(() =>
    {
        var table = TableReader.Read(settings.Spec.DataPath, settings.Spec.Columns, settings.Policy);
        var data = PreparedData.Prepare(table, settings.Spec.Preparation with { Folds = settings.Folds });
        Write(output, data);
        return 0;
    }, errors);

    static void Write(TextWriter o, PreparedData data)
    {
        var table = data.Table;
        var profile = data.Profile;
        var map = data.Labels;

        o.WriteLine($"{table.SourcePath}: {table.Count} rows, {map.Count} classes, tokenizer {data.Tokenizer.Name}");
        if (!table.SkipReport.IsEmpty) o.WriteLine(table.SkipReport.ToString());
        if (data.Count < table.Count) o.WriteLine($"sample: {data.Count} of {table.Count} rows (class-stratified, seed {data.Options.SplitSeed})");
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

        for (int f = 1; f <= data.FoldCount; f++)
        {
            var fold = data.Fold(f);
            o.WriteLine();
            o.WriteLine(data.FoldCount == 1 ? $"Split: {data.SplitDescription}" : $"Split: {data.SplitDescription} — fold {f} of {data.FoldCount}");
            Table(o, new[] { "part", "rows", "median len" }.Concat(map.Names).ToArray(),
                fold.Summary.Parts.Select(p => new[] { p.Part, N(p.Rows), F(p.Lengths.Median) }
                    .Concat(p.ClassCounts.Select((c, k) => $"{c} ({P(p.Proportions[k])})")).ToArray()));
            o.WriteLine($"Vocabulary from train: {fold.Vocabulary.Count} ids; unknown rate " + string.Join(", ",
                fold.Coverage.Select(c => $"{c.Part} {P(c.UnknownRate)} ({c.UnknownTokens} of {c.Tokens})")));
            o.WriteLine();
            var audit = fold.Leakage;
            o.WriteLine(audit.Clean ? "Leakage audit: nothing found" : "Leakage audit");
            foreach (var finding in audit.Findings)
            {
                o.WriteLine($"  {finding.Kind}: {finding.Texts} distinct, {finding.Rows} row(s)");
                foreach (var e in finding.Examples)
                    o.WriteLine($"    \"{Shorten(e.Text)}\" {Shorten(e.Detail)} (lines {string.Join(", ", e.Lines)})");
            }
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
    static string F(double v) => double.IsFinite(v) ? v.ToString("0.##", CultureInfo.InvariantCulture) : "–";
    static string P(double v) => (100 * v).ToString("0.0", CultureInfo.InvariantCulture) + "%";
}
