using System.CommandLine;

namespace Kit.Cli.Commands;

/// <summary>The list of subcommands. Add a new command here, one line each.</summary>
internal static class CommandCatalog
{
    public static IEnumerable<Command> All()
    {
        yield return DemoDataCommand.Build();
        yield return DemoCommand.Build();
        yield return InspectCommand.Build();
        yield return NotebookCommand.Build();
        yield return CompareCommand.Build();
        yield return MergeCommand.Build();
        yield return ReportCommand.Build();
        yield return TrainCommand.Build();
        yield return ScoreCommand.Build();
        yield return ExportCommand.Build();
    }
}
