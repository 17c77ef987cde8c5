using System.CommandLine;
using Kit.DemoData;

namespace Kit.Cli.Commands;

/// <summary>`kit demo-data --out DIR`: rebuilds the invented demo files bit for bit from their seeds.</summary>
internal static class DemoDataCommand
{
    public static Command Build()
    {
        var outOption = new Option<string>("--out") { Description = "Folder to write the demo files into", DefaultValueFactory = _ => "data-demo" };
        var command = new Command("demo-data", "Regenerate the invented demo data sets (seeded, deterministic).") { outOption };
        command.SetAction(parse =>
        {
            foreach (var path in DemoFiles.WriteAll(parse.GetValue(outOption)!))
                Console.WriteLine($"wrote {path}");
            return 0;
        });
        return command;
    }
}
