using System.CommandLine;
using System.Globalization;
using Kit.Models.Onnx;
using Kit.Training;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit export MODEL --onnx OUT.onnx`: the bundle's classifier as an ONNX graph plus OUT.onnx.json (tokenizer,
/// vocabulary, labels, maximum length, truncation policy, training profile), scored by Kit.Scoring without the engine.
/// </summary>
internal static class ExportCommand
{
    public static Command Build()
    {
        var model = new Argument<string>("MODEL") { Description = "A model bundle written by kit train" };
        var onnx = new Option<string>("--onnx") { Description = "ONNX file to write (the side-car goes to FILE.json)", Required = true };
        var opset = new Option<int>("--opset") { Description = "ONNX opset to declare (17 or later)", DefaultValueFactory = _ => ClassifierGraph.Opset };
        var command = new Command("export", "Write a trained bundle as an ONNX graph with its tokenizer and labels beside it.") { model, onnx, opset };
        command.SetAction(parse => CliErrors.Guard(() =>
            Run(parse.GetValue(model)!, parse.GetValue(onnx)!, parse.GetValue(opset))));
        return command;
    }

    static int Run(string modelPath, string onnxPath, int opset)
    {
        if (opset < ClassifierGraph.Opset)
            throw new ArgumentException($"--opset {opset}: the exported graph needs opset {ClassifierGraph.Opset} or later");
        var bundle = ModelBundle.Load(modelPath);
        OnnxExportResult result;
        try
        {
            result = OnnxExport.Write(bundle, onnxPath, opset);
        }
        catch (NotSupportedException e)
        {
            throw new ArgumentException($"{modelPath}: {e.Message}", e);
        }
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"wrote {result.OnnxPath} ({result.Bytes / 1024.0:F0} KiB, opset {opset}, model id {result.ModelId[..12]}) and {result.SidecarPath}"));
        if (bundle.Profile is null)
            Console.Error.WriteLine($"{modelPath}: the bundle has no training profile (trained before profiles existed), so kit score cannot run its drift check on this model");
        return 0;
    }
}
