using System.Globalization;

namespace Kit.Experiments;

/// <summary>
/// One point of a sweep: settings applied on top of the sweep's base <see cref="RunSpec"/>, or one of the two n-gram
/// baselines (naive Bayes, logistic regression). The name ("cell=gru;embed=16") is the config's identity in the results store, so it is built
/// in a fixed key order and never depends on how the grid was typed.
/// </summary>
public sealed record SweepConfig
{
    public const string BaselineName = "naive-bayes";
    public const string LinearBaselineName = "logistic-regression";

    /// <summary>Grid keys in the order names are written, with what each accepts (see <see cref="RunSettings"/>).</summary>
    public static IReadOnlyList<(string Key, string Accepts)> Keys { get; } = RunSettings.GridKeys.Select(k => (k.Key, k.Accepts)).ToArray();

    public string Name { get; }
    public IReadOnlyDictionary<string, string> Settings { get; }
    public bool IsBaseline { get; }

    SweepConfig(IReadOnlyDictionary<string, string> settings, bool baseline, string? baselineName = null)
    {
        Settings = settings;
        IsBaseline = baseline;
        Name = baseline ? baselineName ?? BaselineName
            : settings.Count == 0 ? "base"
            : string.Join(";", Keys.Where(k => settings.ContainsKey(k.Key)).Select(k => $"{k.Key}={settings[k.Key]}"));
    }

    /// <summary>The n-gram naive Bayes baseline.</summary>
    public static SweepConfig Baseline { get; } = new(new Dictionary<string, string>(), baseline: true);

    /// <summary>The tf-idf n-gram logistic regression baseline.</summary>
    public static SweepConfig LinearBaseline { get; } = new(new Dictionary<string, string>(), baseline: true, LinearBaselineName);

    /// <summary>Both baselines, which every comparison carries.</summary>
    public static IReadOnlyList<SweepConfig> Baselines { get; } = [Baseline, LinearBaseline];

    /// <summary>Which baseline this config is (only for baselines).</summary>
    public BaselineKind BaselineKind => Name == LinearBaselineName ? BaselineKind.LogisticRegression : BaselineKind.NaiveBayes;

    /// <summary>A neural config from key/value pairs; each value is checked here, so a typo fails before any run.</summary>
    public static SweepConfig Of(params (string Key, string Value)[] settings)
    {
        var map = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var (rawKey, rawValue) in settings)
        {
            string key = rawKey.Trim().ToLowerInvariant(), value = rawValue.Trim().ToLowerInvariant();
            var known = RunSettings.GridKeys.FirstOrDefault(k => k.Key == key);
            if (known is null)
            {
                bool dataSetting = RunSettings.All.Any(k => k.Key == key);
                throw new ArgumentException(dataSetting
                    ? $"'{rawKey}' is fixed for the whole sweep (it shapes the prepared data); give it as --{key}, not in the grid"
                    : $"unknown sweep setting '{rawKey}'; known: {string.Join(", ", Keys.Select(k => k.Key))}");
            }
            if (!map.TryAdd(key, value)) throw new ArgumentException($"sweep setting '{key}' given twice in one config");
            try { known.Write(RunSettings.Defaults, value); }
            catch (FormatException) { throw new ArgumentException($"sweep setting {key}={rawValue}: expected {known.Accepts}"); }
        }
        return new SweepConfig(map, baseline: false);
    }

    /// <summary>The run spec of this config: the base with this config's settings applied.</summary>
    public RunSpec Apply(RunSpec baseSpec)
    {
        if (IsBaseline) return baseSpec;
        var spec = baseSpec;
        foreach (var key in RunSettings.GridKeys.Where(k => Settings.ContainsKey(k.Key))) spec = key.Apply(spec, Settings[key.Key]);
        return spec;
    }

    public override string ToString() => Name;
}
