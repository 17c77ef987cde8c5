using System.CommandLine;
using Kit.Data;
using Kit.Experiments;
using Kit.Training;
using Kit.Views;

namespace Kit.Cli.Commands;

/// <summary>`kit demo [--out DIR] [--quick]`: the main job on the invented hostname data, ending in a report.</summary>
internal static class DemoCommand
{
    public static Command Build()
    {
        var outOption = new Option<string>("--out") { Description = "Folder for report.html", DefaultValueFactory = _ => "demo-out" };
        var quick = new Option<bool>("--quick") { Description = "A smaller sample and fewer epochs (about a minute on 2 cores)" };
        var data = new Option<string?>("--data") { Description = "Demo data folder (default: data-demo found from the current folder upwards)" };
        var images = new Option<bool>("--images") { Description = "Also save every chart as SVG and PNG, and the report as PNG and PDF (needs a local Chromium)" };
        var command = new Command("demo", "Train a character GRU on the demo hostnames and write a self-contained report.") { outOption, quick, data, images };
        command.SetAction(parse => CliErrors.Guard(() => Run(parse.GetValue(outOption)!, parse.GetValue(quick), parse.GetValue(data), parse.GetValue(images))));
        return command;
    }

    static int Run(string outDir, bool quick, string? dataDir, bool images = false)
    {
        string folder = dataDir ?? DemoDataLocator.Find();
        var spec = Spec(Path.Combine(folder, Kit.DemoData.DemoFiles.Hostnames), quick);
        Console.Error.WriteLine($"{Kit.Native.Engine.EnsureLoaded()}");
        Console.Error.WriteLine($"demo: {(quick ? "quick" : "full")} run on {spec.DataPath}");
        var run = SingleRun.Execute(spec, new ConsoleProgress());
        var report = RunReport.Of(run, title: "Hostname triage — character GRU",
            subtitle: $"Invented demo data ({run.Labels.Count} generator families). Test part: accuracy {run.TestMetrics.Accuracy:P1}, macro F1 {run.TestMetrics.MacroF1:F3}.");
        var files = RunWriter.Write(outDir, report);
        Console.WriteLine($"test accuracy {run.TestMetrics.Accuracy:P2}, macro F1 {run.TestMetrics.MacroF1:F3}");
        Console.WriteLine($"wrote {files}");
        if (images)
        {
            var export = Kit.Export.ReportExport.WriteReport(outDir, report.Title, report.Subtitle, report.Views, images);
            Console.WriteLine(export.Message);
        }
        return 0;
    }

    internal static RunSpec Spec(string path, bool quick) => new()
    {
        DataPath = path,
        Columns = new ColumnSpec("text", "label", "group"),
        MaxLength = 64,
        EmbeddingSize = 32,
        HiddenSize = 64,
        SampleRows = quick ? 6000 : null,
        Training = new TrainingOptions { Epochs = quick ? 4 : 8, BatchSize = 64, LearningRate = 3e-3, Seed = 1 },
        Diagnostics = quick ? DiagnosticsOptions.Quick : new DiagnosticsOptions(),
    };
}
