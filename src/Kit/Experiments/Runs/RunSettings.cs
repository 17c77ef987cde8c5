using System.Globalization;
using Kit.Data;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>Which part of a run a setting changes. Data settings are fixed for a whole sweep; the others may vary by config.</summary>
public enum SettingScope { Data, Model, Training }

/// <summary>
/// One named setting of a run: its key (the command-line flag without "--", and the grid key), what it accepts,
/// how to read it from a <see cref="RunSpec"/> and how to write a value into one. A bad value is an
/// <see cref="ArgumentException"/> that names the key and what it accepts.
/// </summary>
public sealed record RunSetting(string Key, string Help, string Accepts, SettingScope Scope,
    Func<RunSpec, string> Read, Func<RunSpec, string, RunSpec> Write)
{
    /// <summary>True for on/off settings (a bare flag on the command line means "true").</summary>
    public bool IsSwitch { get; init; }

    /// <summary>The value a default <see cref="RunSpec"/> has.</summary>
    public string Default => Read(RunSettings.Defaults);

    /// <summary>Grid keys are the settings that may differ between the configs of one sweep.</summary>
    public bool IsGridKey => Scope != SettingScope.Data && Key is not ("seed" or "threads");

    public RunSpec Apply(RunSpec spec, string value)
    {
        try
        {
            return Write(spec, value.Trim());
        }
        catch (FormatException)
        {
            throw new ArgumentException($"{Key} = '{value}': expected {Accepts}");
        }
    }
}

/// <summary>
/// The one vocabulary of run settings. <c>kit train</c> and <c>kit compare</c> build their flags from it, sweep
/// grids take their keys from it and <see cref="RunSpec"/> is what it reads and writes, so names, defaults and
/// help text agree everywhere.
/// </summary>
public static class RunSettings
{
    /// <summary>A run spec with every default (the data path is left empty).</summary>
    public static RunSpec Defaults { get; } = new() { DataPath = "" };

    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static IReadOnlyList<RunSetting> All { get; } =
    [
        // Model. The first nine keep the order sweep config names have always been written in.
        Choice("cell", "Recurrent cell", SettingScope.Model, s => s.Cell, (s, v) => s with { Cell = v },
            ("gru", CellKind.Gru), ("lstm", CellKind.Lstm), ("rnn", CellKind.Rnn)),
        new RunSetting("encoder", "Encoder family (a recurrent cell, a 1-D convolution or a Transformer); sets --cell for the recurrent ones",
            "gru, lstm, rnn, cnn or transformer", SettingScope.Model, s => s.EncoderName,
            (s, v) => v.ToLowerInvariant() switch
            {
                "cnn" => s with { Encoder = EncoderKind.Convolution },
                "transformer" => s with { Encoder = EncoderKind.Transformer },
                "gru" => s with { Encoder = EncoderKind.Recurrent, Cell = CellKind.Gru },
                "lstm" => s with { Encoder = EncoderKind.Recurrent, Cell = CellKind.Lstm },
                "rnn" => s with { Encoder = EncoderKind.Recurrent, Cell = CellKind.Rnn },
                _ => throw new FormatException(),
            }),
        Int("embed", "Embedding size", SettingScope.Model, s => s.EmbeddingSize, (s, v) => s with { EmbeddingSize = v }),
        Int("hidden", "Hidden size", SettingScope.Model, s => s.HiddenSize, (s, v) => s with { HiddenSize = v }),
        Int("layers", "Stacked layers", SettingScope.Model, s => s.Layers, (s, v) => s with { Layers = v }),
        Switch("bidirectional", "Read each sequence both ways", SettingScope.Model, s => s.Bidirectional, (s, v) => s with { Bidirectional = v }),
        Choice("pooling", "How the steps become one vector", SettingScope.Model, s => s.Pooling, (s, v) => s with { Pooling = v },
            ("last", PoolingKind.Last), ("mean", PoolingKind.Mean), ("max", PoolingKind.Max), ("attention", PoolingKind.Attention)),
        Int("heads", "Attention heads of the Transformer encoder (must divide the hidden size)", SettingScope.Model, s => s.Heads, (s, v) => s with { Heads = v }),
        Choice("positions", "Position encoding of the Transformer encoder", SettingScope.Model, s => s.Positions, (s, v) => s with { Positions = v },
            ("sinusoidal", PositionKind.Sinusoidal), ("learned", PositionKind.Learned)),
        Rate("dropout", "Dropout on the embeddings, between layers and before the head", s => s.Dropout, (s, v) => s with { Dropout = v }),
        OptionalRate("embed-dropout", "Dropout on the embeddings alone (none = the dropout setting)", s => s.EmbeddingDropout, (s, v) => s with { EmbeddingDropout = v }),
        OptionalRate("layer-dropout", "Dropout between layers alone (none = the dropout setting)", s => s.LayerDropout, (s, v) => s with { LayerDropout = v }),
        OptionalRate("head-dropout", "Dropout before the head alone (none = the dropout setting)", s => s.HeadDropout, (s, v) => s with { HeadDropout = v }),
        Int("epochs", "Epochs", SettingScope.Training, s => s.Training.Epochs, (s, v) => s with { Training = s.Training with { Epochs = v } }),
        Int("batch", "Batch size", SettingScope.Training, s => s.Training.BatchSize, (s, v) => s with { Training = s.Training with { BatchSize = v } }),
        Number("lr", "Peak learning rate", SettingScope.Training, s => s.Training.LearningRate,
            (s, v) => s with { Training = s.Training with { LearningRate = v } }, positive: true),
        // Training
        Choice("optimizer", "Optimiser", SettingScope.Training, s => s.Training.Optimizer, (s, v) => s with { Training = s.Training with { Optimizer = v } },
            ("adam", OptimizerKind.Adam), ("adamw", OptimizerKind.AdamW), ("sgd", OptimizerKind.Sgd)),
        Choice("schedule", "Learning-rate schedule", SettingScope.Training, s => s.Training.Schedule.Kind,
            (s, v) => s with { Training = s.Training with { Schedule = s.Training.Schedule with { Kind = v } } },
            ("constant", ScheduleKind.Constant), ("warmup-cosine", ScheduleKind.WarmupCosine), ("step", ScheduleKind.Step), ("plateau", ScheduleKind.ReduceOnPlateau)),
        Number("weight-decay", "L2 (adam, sgd) or decoupled (adamw) weight decay", SettingScope.Training, s => s.Training.WeightDecay,
            (s, v) => s with { Training = s.Training with { WeightDecay = v } }, positive: false),
        Optional("clip", "Clip the global gradient norm to this (none = no clipping)", "none or a positive number", SettingScope.Training,
            s => s.Training.MaxGradientNorm, (s, v) => s with { Training = s.Training with { MaxGradientNorm = v } }, PositiveNumber),
        Choice("class-weights", "Class weights in the loss", SettingScope.Training, s => s.Training.ClassWeighting,
            (s, v) => s with { Training = s.Training with { ClassWeighting = v } }, ("none", ClassWeighting.None), ("inverse", ClassWeighting.InverseFrequency)),
        Number("label-smoothing", "Label smoothing ε (share of the target spread over all classes)", SettingScope.Training, s => s.Training.LabelSmoothing,
            (s, v) => s with { Training = s.Training with { LabelSmoothing = v } }, positive: false),
        Choice("keep-best-by", "Validation figure that picks the kept epoch and drives stopping", SettingScope.Training, s => s.Training.Monitor,
            (s, v) => s with { Training = s.Training with { Monitor = v } },
            ("accuracy", MonitorMetric.ValidationAccuracy), ("loss", MonitorMetric.ValidationLoss), ("macro-f1", MonitorMetric.ValidationMacroF1)),
        Optional("stop-after", "Stop after this many epochs without improvement (none = train every epoch)", "none or a positive integer", SettingScope.Training,
            s => s.Training.Patience, (s, v) => s with { Training = s.Training with { Patience = v } }, PositiveInt),
        new RunSetting("seed", "Training seed (weights, batch order); a sweep counts up from it", "a non-negative integer", SettingScope.Training,
            s => s.Training.Seed.ToString(Inv),
            (s, v) => s with { Training = s.Training with { Seed = ulong.TryParse(v, NumberStyles.None, Inv, out ulong x) ? x : throw new FormatException() } }),
        new RunSetting("threads", "Engine threads (0 = one per core; compare: cores / workers)", "a non-negative integer", SettingScope.Training,
            s => s.Training.Threads.ToString(Inv),
            (s, v) => s with { Training = s.Training with { Threads = int.TryParse(v, NumberStyles.None, Inv, out int x) ? x : throw new FormatException() } }),
        // Data
        new RunSetting("tokenizer", "Token unit", "character, character-folded, byte or word", SettingScope.Data,
            s => s.Tokenizer switch { TokenizerKind.Byte => "byte", TokenizerKind.Word => "word", _ => s.FoldCase ? "character-folded" : "character" },
            (s, v) => v.ToLowerInvariant() switch
            {
                "character" => s with { Tokenizer = TokenizerKind.Character, FoldCase = false },
                "character-folded" => s with { Tokenizer = TokenizerKind.Character, FoldCase = true },
                "byte" => s with { Tokenizer = TokenizerKind.Byte, FoldCase = false },
                "word" => s with { Tokenizer = TokenizerKind.Word, FoldCase = false },
                _ => throw new FormatException(),
            }),
        Int("max-length", "Tokens kept per row (longer rows are cut)", SettingScope.Data, s => s.MaxLength, (s, v) => s with { MaxLength = v }),
        Choice("truncation", "Which tokens a cut row keeps", SettingScope.Data, s => s.Truncation, (s, v) => s with { Truncation = v },
            ("head", TruncationPolicy.KeepHead), ("tail", TruncationPolicy.KeepTail), ("head-and-tail", TruncationPolicy.HeadAndTail)),
        Int("min-count", "Tokens seen fewer times in the training part become unknown", SettingScope.Data, s => s.MinTokenCount, (s, v) => s with { MinTokenCount = v }),
        Optional("sample", "Use a class-stratified sample of this many rows (none = all rows)", "none or a positive integer", SettingScope.Data,
            s => s.SampleRows, (s, v) => s with { SampleRows = v }, PositiveInt),
        new RunSetting("holdout", "Train/validation/test fractions of the holdout split", "three fractions adding up to 1, e.g. 0.7/0.15/0.15", SettingScope.Data,
            s => FormattableString.Invariant($"{s.TrainFraction}/{s.ValidationFraction}/{s.TestFraction}"), WriteFractions),
        new RunSetting("split-seed", "Seed of the split (and the sample); fixed across configs and training seeds", "a non-negative integer", SettingScope.Data,
            s => s.SplitSeed.ToString(Inv), (s, v) => s with { SplitSeed = ulong.TryParse(v, NumberStyles.None, Inv, out ulong x) ? x : throw new FormatException() }),
    ];

    /// <summary>The setting called <paramref name="key"/>; an <see cref="ArgumentException"/> listing the keys otherwise.</summary>
    public static RunSetting Find(string key) =>
        All.FirstOrDefault(s => string.Equals(s.Key, key.Trim(), StringComparison.OrdinalIgnoreCase))
        ?? throw new ArgumentException($"unknown setting '{key}'; known: {string.Join(", ", All.Select(s => s.Key))}");

    /// <summary>The settings a sweep grid may vary, in the order config names are written.</summary>
    public static IReadOnlyList<RunSetting> GridKeys { get; } = All.Where(s => s.IsGridKey).ToArray();

    static RunSetting Int(string key, string help, SettingScope scope, Func<RunSpec, int> read, Func<RunSpec, int, RunSpec> write) =>
        new(key, help, "a positive integer", scope, s => read(s).ToString(Inv), (s, v) => write(s, PositiveInt(v)));

    static RunSetting Number(string key, string help, SettingScope scope, Func<RunSpec, double> read, Func<RunSpec, double, RunSpec> write, bool positive) =>
        new(key, help, positive ? "a positive number" : "a non-negative number", scope, s => read(s).ToString("R", Inv),
            (s, v) => write(s, positive ? PositiveNumber(v) : NonNegativeNumber(v)));

    static RunSetting Switch(string key, string help, SettingScope scope, Func<RunSpec, bool> read, Func<RunSpec, bool, RunSpec> write) =>
        new(key, help, "true or false", scope, s => read(s) ? "true" : "false",
            (s, v) => write(s, v.ToLowerInvariant() switch { "true" => true, "false" => false, _ => throw new FormatException() })) { IsSwitch = true };

    static RunSetting Choice<T>(string key, string help, SettingScope scope, Func<RunSpec, T> read, Func<RunSpec, T, RunSpec> write,
        params (string Name, T Value)[] choices) where T : struct =>
        new(key, help, Either(choices.Select(c => c.Name).ToArray()), scope,
            s => choices.First(c => EqualityComparer<T>.Default.Equals(c.Value, read(s))).Name,
            (s, v) =>
            {
                foreach (var c in choices)
                    if (string.Equals(c.Name, v, StringComparison.OrdinalIgnoreCase)) return write(s, c.Value);
                throw new FormatException();
            });

    static RunSetting Optional<T>(string key, string help, string accepts, SettingScope scope, Func<RunSpec, T?> read, Func<RunSpec, T?, RunSpec> write,
        Func<string, T> parse) where T : struct, IFormattable =>
        new(key, help, accepts, scope, s => read(s) is T x ? x.ToString(null, Inv) : "none",
            (s, v) => write(s, string.Equals(v, "none", StringComparison.OrdinalIgnoreCase) ? null : parse(v)));

    static string Either(string[] names) => names.Length == 1 ? names[0] : string.Join(", ", names[..^1]) + " or " + names[^1];

    static RunSetting Rate(string key, string help, Func<RunSpec, double> read, Func<RunSpec, double, RunSpec> write) =>
        new(key, help, "a rate in [0, 1)", SettingScope.Model, s => read(s).ToString("R", Inv), (s, v) => write(s, RateValue(v)));

    static RunSetting OptionalRate(string key, string help, Func<RunSpec, double?> read, Func<RunSpec, double?, RunSpec> write) =>
        Optional(key, help, "none or a rate in [0, 1)", SettingScope.Model, read, write, RateValue);

    static double RateValue(string v) =>
        double.TryParse(v, NumberStyles.Float, Inv, out double x) && x >= 0 && x < 1 ? x : throw new FormatException();

    static RunSpec WriteFractions(RunSpec s, string v)
    {
        var parts = v.Split('/', ',');
        if (parts.Length != 3) throw new FormatException();
        var f = parts.Select(NonNegativeNumber).ToArray();
        if (Math.Abs(f.Sum() - 1) > 1e-9 || f[0] <= 0) throw new FormatException();
        return s with { TrainFraction = f[0], ValidationFraction = f[1], TestFraction = f[2] };
    }

    static int PositiveInt(string v) => int.TryParse(v, NumberStyles.None, Inv, out int n) && n > 0 ? n : throw new FormatException();

    static double PositiveNumber(string v) =>
        double.TryParse(v, NumberStyles.Float, Inv, out double x) && x > 0 && double.IsFinite(x) ? x : throw new FormatException();

    static double NonNegativeNumber(string v) =>
        double.TryParse(v, NumberStyles.Float, Inv, out double x) && x >= 0 && double.IsFinite(x) ? x : throw new FormatException();
}
