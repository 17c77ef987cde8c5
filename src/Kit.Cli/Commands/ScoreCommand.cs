using System.CommandLine;
using System.Globalization;
using System.Text;
using Kit.Common;
using Kit.Data;
using Kit.Training;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit score MODEL DATA --out FILE.csv`: one output row per input row with the predicted label and every class
/// probability. Rows with no tokens, or only tokens the model never saw, get a flag and no prediction.
/// </summary>
internal static class ScoreCommand
{
    public static Command Build()
    {
        var model = new Argument<string>("MODEL") { Description = "A model bundle written by kit train, or an n-gram baseline file" };
        var data = new Argument<string>("DATA") { Description = "Rows to score (.csv, .tsv, .jsonl)" };
        var outFile = new Option<string>("--out") { Description = "CSV file to write", Required = true };
        var text = new Option<string>("--text") { Description = "Text column", DefaultValueFactory = _ => "text" };
        var label = new Option<string?>("--label") { Description = "Optional label column, copied to the output beside the prediction" };
        var command = new Command("score", "Score rows with a trained model bundle; flag rows it cannot read.") { model, data, outFile, text, label };
        command.SetAction(parse => CliErrors.Guard((() =>
            Run(parse.GetValue(model)!, parse.GetValue(data)!, parse.GetValue(outFile)!, parse.GetValue(text)!, parse.GetValue(label)))));
        return command;
    }

    static int Run(string modelPath, string dataPath, string outPath, string textColumn, string? labelColumn)
    {
        // A neural bundle or an n-gram baseline file: both give the same scores, so the output is the same.
        LabelMap labels;
        Func<IReadOnlyList<string>, TextScores> score;
        if (File.Exists(modelPath) && Kit.Experiments.NgramModelFile.IsOne(modelPath))
        {
            var baseline = Kit.Experiments.NgramModelFile.Load(modelPath);
            (labels, score) = (baseline.Labels, baseline.Score);
        }
        else
        {
            var bundle = ModelBundle.Load(modelPath);
            (labels, score) = (bundle.Labels, texts => TextScorer.Score(bundle, texts));
        }
        // Without a label column the text column stands in for it; those values are never used.
        var table = TableReader.Read(dataPath, new ColumnSpec(textColumn, labelColumn ?? textColumn), RowPolicy.Skip);
        if (!table.SkipReport.IsEmpty)
            Console.Error.WriteLine($"{dataPath}: {table.SkipReport} — these rows are not in the output");
        var scores = score(table.Texts);
        AtomicFile.WriteAllText(outPath, Csv(labels, table, scores, labelColumn is not null));
        foreach (var group in scores.Flags.Select((f, i) => (f, i)).Where(p => p.f != ScoreFlag.None).GroupBy(p => p.f))
            Console.Error.WriteLine($"{dataPath}: {group.Count()} row(s) flagged {FlagText(group.Key)} (first at line {string.Join(", ", group.Take(5).Select(p => table.Lines[p.i]))}); no prediction given");
        Console.WriteLine($"scored {scores.Count - scores.FlaggedCount} of {scores.Count} rows; wrote {outPath}");
        return 0;
    }

    internal static string FlagText(ScoreFlag f) => f switch
    {
        ScoreFlag.Empty => "empty",
        ScoreFlag.AllUnknown => "all-unknown",
        _ => "",
    };

    internal static string Csv(LabelMap labels, LabelledTable table, TextScores scores, bool withLabel)
    {
        var inv = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        var header = new List<string> { "line" };
        if (withLabel) header.Add("label");
        header.AddRange(new[] { "predicted", "flag", "tokens", "truncated" });
        header.AddRange(labels.Names.Select(n => "p_" + n));
        sb.AppendLine(string.Join(',', header.Select(Quote)));
        for (int i = 0; i < scores.Count; i++)
        {
            var cells = new List<string> { table.Lines[i].ToString(inv) };
            if (withLabel) cells.Add(Quote(table.Labels[i]));
            cells.Add(scores.Predicted[i] >= 0 ? Quote(labels.Names[scores.Predicted[i]]) : "");
            cells.Add(FlagText(scores.Flags[i]));
            cells.Add(scores.Tokens[i].ToString(inv));
            cells.Add(scores.Truncated[i] ? "true" : "false");
            var p = scores.Probabilities[i];
            for (int k = 0; k < labels.Count; k++) cells.Add(p is null ? "" : p[k].ToString("R", inv));
            sb.AppendLine(string.Join(',', cells));
        }
        return sb.ToString();
    }

    static string Quote(string s) => s.IndexOfAny(new[] { ',', '"', '\n', '\r' }) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
}
