using System.CommandLine;
using System.Globalization;
using Kit.Experiments;
using Kit.Views;

namespace Kit.Cli.Commands;

/// <summary>`kit report DIR`: rebuilds DIR/report.html (and prints the per-config table) from the runs the store holds.</summary>
internal static class ReportCommand
{
    public static Command Build()
    {
        var dir = new Argument<string>("DIR") { Description = "Results folder written by kit compare" };
        var command = new Command("report", "Rebuild the comparison report from a results folder.") { dir };
        command.SetAction(parse => CliErrors.Guard(() => Write(parse.GetValue(dir)!)));
        return command;
    }

    /// <summary>The data file's name from the sweep description, else the folder's name.</summary>
    static string DataName(string dir)
    {
        string definition = Path.Combine(dir, ResultsStore.DefinitionFile);
        if (File.Exists(definition))
        {
            try
            {
                using var doc = System.Text.Json.JsonDocument.Parse(File.ReadAllText(definition));
                if (doc.RootElement.TryGetProperty("base_spec", out var spec) && spec.TryGetProperty("DataPath", out var data) && data.GetString() is { Length: > 0 } name)
                    return name;
            }
            catch (System.Text.Json.JsonException) { }
        }
        return Path.GetFileName(Path.GetFullPath(dir).TrimEnd('/'));
    }

    internal static int Write(string dir)
    {
        var contents = ResultsStore.Read(dir);
        foreach (var note in contents.Notes) Console.Error.WriteLine($"note: {note}");
        if (contents.Records.Count == 0)
        {
            Console.Error.WriteLine($"report: no finished runs in {dir}");
            return 1;
        }
        var search = SearchRecord.Read(dir);
        var comparison = search is null ? ComparisonRecord.Build(contents.Records, contents.Notes)
            : ComparisonRecord.Build(SearchRecord.Finalists(contents.Records, SearchLog.Read(dir)), contents.Notes) with { Search = search };
        string path = ComparisonReport.Write(dir, comparison, DataName(dir));
        var inv = CultureInfo.InvariantCulture;
        Console.WriteLine(string.Create(inv, $"{"config",-28} {"settings",-40} {"runs",4} {"accuracy",9} {"sd",7} {"macro F1",8} {"ECE",6} {"params",10}"));
        foreach (var s in comparison.Configs)
            Console.WriteLine(string.Create(inv,
                $"{s.Label,-28} {s.Config,-40} {s.Runs,4} {s.Accuracy.Mean,9:P2} {Spread(s.Accuracy.StandardDeviation),7} {s.MacroF1.Mean,8:F3} {s.Ece.Mean,6:F3} {s.Parameters,10:N0}"));
        if (search?.Choice is { } choice) Console.WriteLine($"search chose {choice.Configs[0]}; model {Path.Combine(dir, choice.ModelFile ?? "")}");
        if (search?.BudgetCut == true) Console.WriteLine("the budget cut the search short (see the report's search rungs)");
        Console.WriteLine();
        Console.WriteLine(comparison.Verdict.Sentence());
        Console.WriteLine();
        Console.WriteLine($"wrote {path}");
        return 0;
    }

    /// <summary>A spread needs two runs; with one there is none to show, so the table says "–" rather than NaN.</summary>
    internal static string Spread(double sd) => double.IsFinite(sd) ? sd.ToString("F4", CultureInfo.InvariantCulture) : "–";
}
