using System.CommandLine;
using Kit.Cli.Commands;

namespace Kit.Cli;

public static class Program
{
    /// <summary>Every command the tool offers; each lives in its own file under Commands/.</summary>
    internal static RootCommand BuildRoot()
    {
        var root = new RootCommand("kit: compare recurrent sequence classifiers and write report-ready diagnostics.");
        foreach (var command in CommandCatalog.All())
            root.Subcommands.Add(command);
        return root;
    }

    public static int Main(string[] args) => CliErrors.Invoke(BuildRoot(), args);
}
