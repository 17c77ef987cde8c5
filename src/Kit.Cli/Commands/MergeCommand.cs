using System.CommandLine;
using Kit.Experiments;

namespace Kit.Cli.Commands;

/// <summary>`kit merge DIR`: folds every shard file of DIR into DIR/runs.jsonl (atomically), then removes the shard files.</summary>
internal static class MergeCommand
{
    public static Command Build()
    {
        var dir = new Argument<string>("DIR") { Description = "Results folder whose shards (runs.shard-I-of-N.jsonl) to combine" };
        var command = new Command("merge", "Combine the shard files of a results folder into one store.") { dir };
        command.SetAction(parse => CliErrors.Guard(() => Run(parse.GetValue(dir)!)));
        return command;
    }

    static int Run(string dir)
    {
        if (!Directory.Exists(dir)) { Console.Error.WriteLine($"merge: no folder {dir}"); return 1; }
        var files = ResultsStore.Files(dir);
        var merged = ResultsStore.Merge(dir);
        foreach (var note in merged.Notes) Console.Error.WriteLine($"note: {note}");
        Console.WriteLine($"merged {files.Count} file(s) into {Path.Combine(dir, ResultsStore.MainFile)}: {merged.Records.Count} run(s)");
        return 0;
    }
}
