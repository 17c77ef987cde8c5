using System.Globalization;

namespace Kit.Experiments;

/// <summary>
/// Short names for the configs of one comparison: each neural config is named by the settings that differ
/// between the comparison's neural configs ("gru · bi", "h128 · d0.2"), the baselines by what they are. A key a
/// config does not set counts at its default, so "cell=gru" and "cell=gru;hidden=64" differ in the hidden size
/// only when 64 is not the default. Labels are unique: configs whose short labels collide keep their full name.
/// </summary>
public static class ConfigLabels
{
    /// <summary>One config as the labeller sees it: its full name, its grid settings and whether it is a baseline.</summary>
    public sealed record Entry(string Config, IReadOnlyDictionary<string, string> Settings, bool Baseline);

    /// <summary>Full config name → short label, for every entry.</summary>
    public static IReadOnlyDictionary<string, string> Of(IReadOnlyList<Entry> configs)
    {
        var neural = configs.Where(c => !c.Baseline).ToArray();
        var keys = RunSettings.GridKeys.Select(k => k.Key).Where(k => neural.Any(c => c.Settings.ContainsKey(k))).ToArray();
        var varying = keys.Where(k => neural.Select(c => Value(c, k)).Distinct(StringComparer.Ordinal).Count() > 1).ToArray();
        var labels = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var c in configs)
        {
            if (c.Baseline) { labels[c.Config] = BaselineLabel(c.Config); continue; }
            // A lone neural config has nothing to differ from: it is named by what it sets.
            var shown = varying.Length > 0 ? varying : keys.Where(c.Settings.ContainsKey).ToArray();
            labels[c.Config] = shown.Length == 0 ? c.Config : string.Join(" · ", shown.Select(k => Short(k, Value(c, k))));
        }
        foreach (var clash in labels.GroupBy(p => p.Value, StringComparer.Ordinal).Where(g => g.Count() > 1).ToArray())
            foreach (var (config, _) in clash) labels[config] = config;
        return labels;
    }

    /// <summary>The baselines' plain names.</summary>
    public static string BaselineLabel(string config) => config switch
    {
        SweepConfig.BaselineName => "naive Bayes",
        SweepConfig.LinearBaselineName => "logistic regression",
        _ => config,
    };

    /// <summary>The settings a config gives, in the order config names are written ("cell=gru; hidden=128").</summary>
    public static string Describe(IReadOnlyDictionary<string, string> settings) =>
        string.Join("; ", settings.OrderBy(p => Order(p.Key)).Select(p => $"{p.Key}={p.Value}"));

    static int Order(string key)
    {
        for (int i = 0; i < RunSettings.GridKeys.Count; i++) if (RunSettings.GridKeys[i].Key == key) return i;
        return int.MaxValue;
    }

    static string Value(Entry c, string key) =>
        c.Settings.TryGetValue(key, out var v) ? v : RunSettings.GridKeys.First(k => k.Key == key).Default;

    /// <summary>A setting in a few characters: the value alone where it names itself, a letter and the number otherwise.</summary>
    internal static string Short(string key, string value) => key switch
    {
        "cell" or "encoder" or "positions" or "optimizer" or "schedule" => value,
        "bidirectional" => value == "true" ? "bi" : "uni",
        "pooling" => value + " pool",
        "embed" => "e" + value,
        "hidden" => "h" + value,
        "layers" => value + (value == "1" ? " layer" : " layers"),
        "heads" => value + (value == "1" ? " head" : " heads"),
        "dropout" => "d" + Trim(value),
        "epochs" => value + " ep",
        "batch" => "b" + value,
        "lr" => "lr " + Trim(value),
        _ => $"{key} {value}",
    };

    static string Trim(string value) =>
        double.TryParse(value, NumberStyles.Float, CultureInfo.InvariantCulture, out double d) ? d.ToString("0.#####", CultureInfo.InvariantCulture) : value;
}
