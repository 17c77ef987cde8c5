using System.CommandLine;
using System.Globalization;
using System.Text;
using Kit.Common;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Scoring;
using Kit.Training;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit score MODEL DATA --out FILE.csv`: one output row per input row with the predicted label and every class
/// probability. MODEL is a bundle (scored by the engine) or an exported .onnx file (scored by Kit.Scoring on ONNX
/// Runtime). Rows with no tokens, or only tokens the model never saw, get a flag and no prediction; rows longer than
/// the model's maximum length are cut by its truncation policy and marked in the truncated column. When the model
/// carries a training profile, a drift summary is printed and FILE.drift.json written beside the scores.
/// </summary>
internal static class ScoreCommand
{
    public static Command Build()
    {
        var model = new Argument<string>("MODEL") { Description = "A model bundle written by kit train, an .onnx file written by kit export, or an n-gram baseline file (kit train --baselines)" };
        var data = new Argument<string>("DATA") { Description = "Rows to score (.csv, .tsv, .jsonl)" };
        var outFile = new Option<string>("--out") { Description = "CSV file to write", Required = true };
        var text = new Option<string>("--text") { Description = "Text column", DefaultValueFactory = _ => "text" };
        var label = new Option<string?>("--label") { Description = "Optional label column, copied to the output beside the prediction" };
        var sidecar = new Option<string?>("--sidecar") { Description = "Side-car JSON of an .onnx model (default: MODEL.json, else the copy inside the graph)" };
        var command = new Command("score", "Score rows with a trained model bundle or exported ONNX model; flag rows it cannot read; check drift.")
        {
            model, data, outFile, text, label, sidecar,
        };
        command.SetAction(parse => CliErrors.Guard(() =>
            Run(parse.GetValue(model)!, parse.GetValue(data)!, parse.GetValue(outFile)!, parse.GetValue(text)!, parse.GetValue(label), parse.GetValue(sidecar))));
        return command;
    }

    /// <summary>Scores of either path, in one shape: per row the prediction and the counts the drift check reads.</summary>
    internal sealed record ScoredRows(IReadOnlyList<string> LabelNames, int MaxLength, string Truncation, int[] Predicted, double[]?[] Probabilities,
        ScoreFlag[] Flags, int[] Tokens, int[] RawTokens, int[] UnknownTokens, bool[] Truncated, TrainingProfile? Profile)
    {
        public int Count => Predicted.Length;
        public int FlaggedCount => Flags.Count(f => f != ScoreFlag.None);
    }

    static int Run(string modelPath, string dataPath, string outPath, string textColumn, string? labelColumn, string? sidecarPath)
    {
        bool onnx = IsOnnx(modelPath);
        if (!onnx && sidecarPath is not null) throw new ArgumentException("--sidecar applies to .onnx models only");
        // Without a label column the text column stands in for it; those values are never used.
        var table = TableReader.Read(dataPath, new ColumnSpec(textColumn, labelColumn ?? textColumn), RowPolicy.Skip);
        if (!table.SkipReport.IsEmpty)
            Console.Error.WriteLine($"{dataPath}: {table.SkipReport} — these rows are not in the output");
        var scores = onnx ? WithOnnx(modelPath, sidecarPath, table.Texts)
            : File.Exists(modelPath) && Kit.Experiments.NgramModelFile.IsOne(modelPath) ? WithBaseline(Kit.Experiments.NgramModelFile.Load(modelPath), table.Texts)
            : WithBundle(ModelBundle.Load(modelPath), table.Texts);
        AtomicFile.WriteAllText(outPath, Csv(scores.LabelNames, table, scores, labelColumn is not null));
        foreach (var group in scores.Flags.Select((f, i) => (f, i)).Where(p => p.f != ScoreFlag.None).GroupBy(p => p.f))
            Console.Error.WriteLine($"{dataPath}: {group.Count()} row(s) flagged {FlagText(group.Key)} (first at line {string.Join(", ", group.Take(5).Select(p => table.Lines[p.i]))}); no prediction given");
        int cut = scores.Truncated.Count(t => t);
        if (cut > 0)
            Console.Error.WriteLine($"{dataPath}: {cut} row(s) longer than the model's maximum of {scores.MaxLength} tokens were cut ({scores.Truncation}); see the truncated column");
        Console.WriteLine($"scored {scores.Count - scores.FlaggedCount} of {scores.Count} rows{(onnx ? " with ONNX Runtime" : "")}; wrote {outPath}");
        WriteDrift(scores, modelPath, outPath);
        return 0;
    }

    /// <summary>A bundle starts with its magic; anything else named .onnx goes to ONNX Runtime (which judges whether it is ONNX).</summary>
    internal static bool IsOnnx(string path)
    {
        if (!File.Exists(path)) return path.EndsWith(".onnx", StringComparison.OrdinalIgnoreCase);
        using var stream = File.OpenRead(path);
        var head = new byte[ModelBundle.Magic.Length];
        int read = stream.ReadAtLeast(head, head.Length, throwOnEndOfStream: false);
        bool bundle = read == head.Length && Encoding.ASCII.GetString(head) == ModelBundle.Magic;
        return !bundle && path.EndsWith(".onnx", StringComparison.OrdinalIgnoreCase);
    }

    static void WriteDrift(ScoredRows scores, string modelPath, string outPath)
    {
        if (scores.Profile is null)
        {
            Console.Error.WriteLine($"{modelPath}: no training profile in this model, so no drift check (re-train and re-export to get one)");
            return;
        }
        var drift = BundleDrift.Compare(scores.Profile, scores.Probabilities, scores.Predicted, scores.Tokens,
            new TokenCounts(scores.RawTokens, scores.UnknownTokens));
        string driftPath = DriftPath(outPath);
        AtomicFile.WriteAllText(driftPath, drift.ToJson());
        Console.WriteLine(drift.Summary());
        Console.WriteLine($"wrote {driftPath}");
    }

    internal static string DriftPath(string outPath) => Path.ChangeExtension(outPath, null) + ".drift.json";

    internal static ScoredRows WithBundle(ModelBundle bundle, IReadOnlyList<string> texts)
    {
        var s = TextScorer.Score(bundle, texts);
        var counts = BundleDrift.Count(s);
        return new ScoredRows(bundle.Labels.Names, bundle.MaxLength, bundle.Truncation.ToString(), s.Predicted, s.Probabilities, s.Flags,
            s.Tokens, counts.Raw, counts.Unknown, s.Truncated, bundle.Profile);
    }

    /// <summary>An n-gram baseline file: same output; it keeps no training profile, so no drift check.</summary>
    internal static ScoredRows WithBaseline(Kit.Experiments.NgramModelFile baseline, IReadOnlyList<string> texts)
    {
        var s = baseline.Score(texts);
        return new ScoredRows(baseline.Labels.Names, int.MaxValue, "none", s.Predicted, s.Probabilities, s.Flags, s.Tokens, s.Tokens,
            new int[s.Count], s.Truncated, null);
    }

    internal static ScoredRows WithOnnx(string onnxPath, string? sidecarPath, IReadOnlyList<string> texts)
    {
        using var model = ScoringModel.Load(onnxPath, sidecarPath);
        var s = model.Score(texts);
        TrainingProfile? profile = null;
        if (model.Manifest.ProfileJson is string json)
        {
            try
            {
                profile = TrainingProfile.FromJson(json, onnxPath);
            }
            catch (FormatException e)
            {
                throw new ScoringModelError(sidecarPath ?? onnxPath, e.Message, e);
            }
        }
        return new ScoredRows(model.Labels, model.MaxLength, model.Manifest.Truncation, s.Select(r => r.ClassId).ToArray(),
            s.Select(r => r.Probabilities?.Select(p => (double)p).ToArray()).ToArray(),
            s.Select(r => r.Flag switch { RowFlag.Empty => ScoreFlag.Empty, RowFlag.AllUnknown => ScoreFlag.AllUnknown, _ => ScoreFlag.None }).ToArray(),
            s.Select(r => r.Tokens).ToArray(), s.Select(r => r.RawTokens).ToArray(), s.Select(r => r.UnknownTokens).ToArray(),
            s.Select(r => r.Truncated).ToArray(), profile);
    }

    internal static string FlagText(ScoreFlag f) => f switch
    {
        ScoreFlag.Empty => "empty",
        ScoreFlag.AllUnknown => "all-unknown",
        _ => "",
    };

    internal static string Csv(IReadOnlyList<string> labelNames, LabelledTable table, ScoredRows scores, bool withLabel)
    {
        var inv = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        var header = new List<string> { "line" };
        if (withLabel) header.Add("label");
        header.AddRange(new[] { "predicted", "flag", "tokens", "truncated" });
        header.AddRange(labelNames.Select(n => "p_" + n));
        sb.AppendLine(string.Join(',', header.Select(Quote)));
        for (int i = 0; i < scores.Count; i++)
        {
            var cells = new List<string> { table.Lines[i].ToString(inv) };
            if (withLabel) cells.Add(Quote(table.Labels[i]));
            cells.Add(scores.Predicted[i] >= 0 ? Quote(labelNames[scores.Predicted[i]]) : "");
            cells.Add(FlagText(scores.Flags[i]));
            cells.Add(scores.Tokens[i].ToString(inv));
            cells.Add(scores.Truncated[i] ? "true" : "false");
            var p = scores.Probabilities[i];
            for (int k = 0; k < labelNames.Count; k++) cells.Add(p is null ? "" : p[k].ToString("R", inv));
            sb.AppendLine(string.Join(',', cells));
        }
        return sb.ToString();
    }

    static string Quote(string s) => s.IndexOfAny(new[] { ',', '"', '\n', '\r' }) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
}
