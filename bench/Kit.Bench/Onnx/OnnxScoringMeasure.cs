using System.Diagnostics;
using System.Globalization;
using Kit.Data;
using Kit.Models;
using Kit.Scoring;
using Kit.Training;
using TorchSharp;

namespace Kit.Bench.Onnx;

/// <summary>
/// ONNX Runtime (Kit.Scoring) against the engine (TextScorer on the bundle) for the demo GRU shape (`kit train`
/// defaults: character tokens, embedding 32, hidden 64, one layer, last pooling, max length 64) over demo hostnames.
/// Weights are the seeded initial ones: speed does not depend on their values. Both paths start from raw text
/// (tokenize, encode, run, softmax). Single-row latency: blocks of 100 calls, alternating ONNX and engine, p50 and
/// p99 over every call. Batch throughput: all 19,840 demo rows per pass (ONNX batches of 256, engine of 512, each
/// path's default), passes alternating, median rate. Both use every core (2 here).
/// </summary>
public sealed class OnnxScoringMeasure : IMeasure
{
    const int Blocks = 30, PerBlock = 100, Passes = 3;

    public IReadOnlyList<string> Ids { get; } = new[]
    {
        "onnx-single-p50-ms", "onnx-single-p99-ms", "engine-single-p50-ms", "engine-single-p99-ms", "onnx-single-speedup", "onnx-batch-throughput-ratio",
    };

    public IEnumerable<Figure> Run()
    {
        Kit.Native.Engine.EnsureLoaded();
        EngineThreads.Apply(0);
        var table = TableReader.Read(DemoFile(), new ColumnSpec("text", "label"));
        var tokenizer = new CharacterTokenizer();
        var vocabulary = Vocabulary.Build(table.Texts.Select(tokenizer.Split));
        var labels = table.LabelMap();
        torch.manual_seed(1);
        var model = new ClassifierConfig(vocabulary.Count, labels.Count).Build();
        model.eval();
        var bundle = new ModelBundle { Model = model, Tokenizer = TokenizerSpec.Of(tokenizer), Vocabulary = vocabulary, Labels = labels, MaxLength = 64, Temperature = 1.2 };
        string dir = Path.Combine(Path.GetTempPath(), "kit-bench-onnx-" + Environment.ProcessId);
        Directory.CreateDirectory(dir);
        try
        {
            string path = Path.Combine(dir, "demo-gru.onnx");
            OnnxExport.Write(bundle, path);
            using var onnx = ScoringModel.Load(path);
            var texts = table.Texts;

            // Warm-up: first calls JIT and size both runtimes' pools.
            for (int i = 0; i < 200; i++) { onnx.Score(texts[i]); TextScorer.Score(bundle, new[] { texts[i] }); }
            var onnxTimes = new List<double>();
            var engineTimes = new List<double>();
            int row = 0;
            for (int b = 0; b < Blocks; b++)
            {
                for (int i = 0; i < PerBlock; i++) onnxTimes.Add(Time(() => onnx.Score(texts[row++ % texts.Count])));
                for (int i = 0; i < PerBlock; i++) engineTimes.Add(Time(() => TextScorer.Score(bundle, new[] { texts[row++ % texts.Count] })));
            }
            double o50 = Quantile(onnxTimes, 0.5), o99 = Quantile(onnxTimes, 0.99), e50 = Quantile(engineTimes, 0.5), e99 = Quantile(engineTimes, 0.99);
            string single = $"{Blocks} alternating blocks of {PerBlock} one-row calls each ({onnxTimes.Count} per path), text in → probabilities out, load average {LoadAverage()}";
            yield return new Figure("onnx-single-p50-ms", o50, "ms", "< 0.2 ms", $"ScoringModel.Score(text), ONNX Runtime 1.31.1; {single}");
            yield return new Figure("onnx-single-p99-ms", o99, "ms", "orientation", $"ScoringModel.Score(text); {single}");
            yield return new Figure("engine-single-p50-ms", e50, "ms", "reference", $"TextScorer.Score(bundle, [text]), TorchSharp engine; {single}");
            yield return new Figure("engine-single-p99-ms", e99, "ms", "reference", $"TextScorer.Score(bundle, [text]); {single}");
            yield return new Figure("onnx-single-speedup", e50 / o50, "×", "> 1", $"engine p50 / ONNX p50 of the same run ({e50:F3} ms / {o50:F3} ms)");

            var onnxRates = new List<double>();
            var engineRates = new List<double>();
            onnx.Score(texts);
            TextScorer.Score(bundle, texts);
            for (int p = 0; p < Passes; p++)
            {
                onnxRates.Add(texts.Count / (Time(() => onnx.Score(texts)) / 1000));
                engineRates.Add(texts.Count / (Time(() => TextScorer.Score(bundle, texts)) / 1000));
            }
            double or = Training.TrainingBenchData.Median(onnxRates), er = Training.TrainingBenchData.Median(engineRates);
            yield return new Figure("onnx-batch-throughput-ratio", or / er, "×", "≥ 1",
                string.Create(CultureInfo.InvariantCulture,
                    $"median of {Passes} alternating passes over all {texts.Count} demo hostnames: ONNX {or:F0} rows/s (ScoringModel.Score, batches of 256) vs engine {er:F0} rows/s (TextScorer.Score, batches of 512), load average {LoadAverage()}"));
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
        }
    }

    /// <summary>The 1-minute load average: on a shared machine it says how contended the cores were.</summary>
    static string LoadAverage() => File.Exists("/proc/loadavg") ? File.ReadAllText("/proc/loadavg").Split(' ')[0] : "n/a";

    static string DemoFile()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Kit.sln"))) dir = dir.Parent;
        return Path.Combine(dir?.FullName ?? ".", "data-demo", "hostnames.csv");
    }

    static double Time(Action action)
    {
        long start = Stopwatch.GetTimestamp();
        action();
        return Stopwatch.GetElapsedTime(start).TotalMilliseconds;
    }

    static double Quantile(List<double> values, double q)
    {
        var sorted = values.OrderBy(v => v).ToArray();
        return sorted[Math.Min(sorted.Length - 1, (int)Math.Ceiling(q * sorted.Length) - 1)];
    }
}
