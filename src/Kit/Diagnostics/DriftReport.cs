using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using Kit.Training;
using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>How far one aspect of the scored rows has moved from the training profile.</summary>
public enum DriftLevel { None, Moderate, Major }

/// <summary>One comparison: what was compared, the statistic and its value, the threshold used, and a plain verdict.</summary>
public sealed record DriftCheck(string Aspect, string Statistic, double Value, string Thresholds, DriftLevel Level, string Verdict);

/// <summary>A binned distribution of the reference (training profile) beside the scored rows', for drawing.</summary>
public sealed record DriftHistogram(string Aspect, string[] Bins, double[] Reference, double[] Scored);

/// <summary>
/// Scored rows against the model's training profile: token counts and confidence (PSI and two-sample KS), the
/// unknown-token rate, and the predicted class mix (PSI against the validation rows' predicted mix, with the
/// training prior alongside). Thresholds are the usual ones: PSI below 0.1 stable, 0.1–0.25 moderate, above
/// 0.25 major; KS p below 0.01; unknown rate more than doubled and at least one point higher
/// (all common practice, no source). A warning sign, not a guarantee: a model can be wrong on rows that pass.
/// </summary>
public sealed record DriftReport(int Rows, int ReferenceRows, IReadOnlyList<DriftCheck> Checks, IReadOnlyList<DriftHistogram> Histograms)
{
    public const double PsiModerate = 0.1, PsiMajor = 0.25, KsAlpha = 0.01;
    const string PsiThresholds = "PSI < 0.1 stable, 0.1–0.25 moderate, > 0.25 major (common practice, no source)";

    public DriftLevel Worst => Checks.Count == 0 ? DriftLevel.None : Checks.Max(c => c.Level);

    /// <param name="rawLengths">Token count of each scored row before truncation.</param>
    /// <param name="confidences">Top probability of each scored row that got a prediction.</param>
    /// <param name="predicted">Predicted class id of each such row.</param>
    public static DriftReport Compute(TrainingProfile profile, IReadOnlyList<int> rawLengths, long keptTokens, long unknownTokens,
        IReadOnlyList<double> confidences, IReadOnlyList<int> predicted)
    {
        if (confidences.Count != predicted.Count) throw new ArgumentException($"{confidences.Count} confidences for {predicted.Count} predictions");
        var checks = new List<DriftCheck>();
        var histograms = new List<DriftHistogram>();

        // Token counts: exact lengths for KS; about ten bins of similar reference mass for PSI.
        var refLengths = profile.LengthCounts.Select(c => (double)c).ToArray();
        var curLengths = TrainingProfile.LengthHistogram(rawLengths, profile.LengthCap).Select(c => (double)c).ToArray();
        var groups = LengthGroups(refLengths, 10);
        var refGrouped = Group(refLengths, groups);
        var curGrouped = Group(curLengths, groups);
        histograms.Add(new DriftHistogram("tokens per row", GroupNames(groups, profile.LengthCap), Shares(refGrouped), Shares(curGrouped)));
        AddPsi(checks, "tokens per row", refGrouped, curGrouped);
        AddKs(checks, "tokens per row", refLengths, curLengths, profile.Rows, rawLengths.Count);

        // Confidence: 50 bins for KS, merged five at a time for PSI.
        var refConf = profile.ConfidenceCounts.Select(c => (double)c).ToArray();
        var curConf = TrainingProfile.ConfidenceHistogram(confidences).Select(c => (double)c).ToArray();
        var tenths = Enumerable.Range(0, 10).Select(i => (Start: i * 5, End: i * 5 + 5)).ToArray();
        var refTenths = Group(refConf, tenths);
        var curTenths = Group(curConf, tenths);
        histograms.Add(new DriftHistogram("confidence", tenths.Select(t => string.Create(CultureInfo.InvariantCulture, $"{t.Start / 50.0:0.0}–{t.End / 50.0:0.0}")).ToArray(),
            Shares(refTenths), Shares(curTenths)));
        if (confidences.Count > 0)
        {
            AddPsi(checks, "confidence", refTenths, curTenths);
            AddKs(checks, "confidence", refConf, curConf, refConf.Sum() > 0 ? (long)refConf.Sum() : 0, confidences.Count);
        }

        // Unknown tokens.
        double refRate = profile.UnknownRate, curRate = keptTokens == 0 ? 0 : unknownTokens / (double)keptTokens;
        bool up = curRate > 2 * refRate && curRate - refRate >= 0.01;
        bool upMuch = curRate > 4 * refRate && curRate - refRate >= 0.05;
        checks.Add(new DriftCheck("unknown tokens", "rate", curRate,
            "more than 2× training's and ≥ 1 point higher: moderate; 4× and ≥ 5 points: major (common practice, no source)",
            upMuch ? DriftLevel.Major : up ? DriftLevel.Moderate : DriftLevel.None,
            string.Create(CultureInfo.InvariantCulture, $"{curRate:P2} of kept tokens are unknown to the vocabulary (validation: {refRate:P2})") +
            (up ? ": the rows use many tokens the model never saw" : "")));

        // Predicted class mix.
        int k = profile.Labels.Length;
        var mix = new double[k];
        foreach (int c in predicted) if (c >= 0 && c < k) mix[c]++;
        histograms.Add(new DriftHistogram("predicted class", profile.Labels, profile.PredictedMix.ToArray(), Shares(mix)));
        if (predicted.Count > 0)
        {
            double psi = DriftStatistics.Psi(profile.PredictedMix, mix);
            var level = PsiLevel(psi);
            var shares = Shares(mix);
            int moved = Enumerable.Range(0, k).OrderByDescending(c => Math.Abs(shares[c] - profile.PredictedMix[c])).First();
            checks.Add(new DriftCheck("predicted class mix", "PSI", psi, PsiThresholds, level,
                string.Create(CultureInfo.InvariantCulture,
                    $"{Words(level)}; largest change: '{profile.Labels[moved]}' {shares[moved]:P1} of rows (validation {profile.PredictedMix[moved]:P1}, training prior {profile.ClassPrior[moved]:P1})")));
        }
        return new DriftReport(rawLengths.Count, profile.Rows, checks, histograms);
    }

    static DriftLevel PsiLevel(double psi) => psi > PsiMajor ? DriftLevel.Major : psi >= PsiModerate ? DriftLevel.Moderate : DriftLevel.None;

    static string Words(DriftLevel level) => level switch
    {
        DriftLevel.Major => "major shift from training",
        DriftLevel.Moderate => "moderate shift from training",
        _ => "close to training",
    };

    static void AddPsi(List<DriftCheck> checks, string aspect, double[] reference, double[] current)
    {
        double psi = DriftStatistics.Psi(reference, current);
        var level = PsiLevel(psi);
        checks.Add(new DriftCheck(aspect, "PSI", psi, PsiThresholds, level, Words(level)));
    }

    static void AddKs(List<DriftCheck> checks, string aspect, double[] reference, double[] current, long n, long m)
    {
        double d = DriftStatistics.KsStatistic(reference, current);
        double p = DriftStatistics.KsPValue(d, n, m);
        bool differs = p < KsAlpha;
        checks.Add(new DriftCheck(aspect, "KS D", d, "p < 0.01 (two-sample Kolmogorov–Smirnov; common practice, no source)",
            differs ? DriftLevel.Moderate : DriftLevel.None,
            string.Create(CultureInfo.InvariantCulture, $"p = {p:G3}: ") + (differs ? "the distributions differ" : "no evidence they differ")));
    }

    /// <summary>Consecutive index ranges holding about 1/<paramref name="target"/> of the reference mass each.</summary>
    static (int Start, int End)[] LengthGroups(double[] counts, int target)
    {
        double total = counts.Sum(), share = total / target, run = 0;
        var groups = new List<(int, int)>();
        int start = 0;
        for (int i = 0; i < counts.Length; i++)
        {
            run += counts[i];
            if (run >= share && i < counts.Length - 1)
            {
                groups.Add((start, i + 1));
                start = i + 1;
                run = 0;
            }
        }
        groups.Add((start, counts.Length));
        return groups.ToArray();
    }

    static double[] Group(double[] counts, (int Start, int End)[] groups) =>
        groups.Select(g => counts[g.Start..g.End].Sum()).ToArray();

    static string[] GroupNames((int Start, int End)[] groups, int cap) => groups.Select(g =>
        g.End - 1 >= cap ? $"≥{g.Start}" : g.End - g.Start == 1 ? $"{g.Start}" : $"{g.Start}–{g.End - 1}").ToArray();

    static double[] Shares(double[] counts)
    {
        double total = counts.Sum();
        return counts.Select(c => total > 0 ? c / total : 0).ToArray();
    }

    /// <summary>One line per check, for a terminal.</summary>
    public string Summary()
    {
        var lines = new List<string> { $"drift check: {Rows} scored rows against {ReferenceRows} validation rows of the training run" };
        foreach (var c in Checks)
            lines.Add(string.Create(CultureInfo.InvariantCulture, $"  {c.Aspect,-20} {c.Statistic,-5} {c.Value,8:0.####}  {c.Verdict}"));
        lines.Add("  (a warning sign, not a guarantee: a model can be confidently wrong on rows that pass)");
        return string.Join(Environment.NewLine, lines);
    }

    public string ToJson()
    {
        var root = new JsonObject
        {
            ["format"] = "kit-drift",
            ["version"] = 1,
            ["rows"] = Rows,
            ["referenceRows"] = ReferenceRows,
            ["worst"] = Worst.ToString(),
            ["checks"] = new JsonArray(Checks.Select(c => (JsonNode?)new JsonObject
            {
                ["aspect"] = c.Aspect, ["statistic"] = c.Statistic, ["value"] = double.IsFinite(c.Value) ? c.Value : null,
                ["level"] = c.Level.ToString(), ["verdict"] = c.Verdict, ["thresholds"] = c.Thresholds,
            }).ToArray()),
            ["histograms"] = new JsonArray(Histograms.Select(h => (JsonNode?)new JsonObject
            {
                ["aspect"] = h.Aspect,
                ["bins"] = new JsonArray(h.Bins.Select(b => (JsonNode?)JsonValue.Create(b)).ToArray()),
                ["reference"] = new JsonArray(h.Reference.Select(v => (JsonNode?)JsonValue.Create(v)).ToArray()),
                ["scored"] = new JsonArray(h.Scored.Select(v => (JsonNode?)JsonValue.Create(v)).ToArray()),
            }).ToArray()),
        };
        return root.ToJsonString(new JsonSerializerOptions { WriteIndented = true });
    }

    public DataFrame ToDataFrame() => new(
        new StringDataFrameColumn("aspect", Checks.Select(c => c.Aspect)),
        new StringDataFrameColumn("statistic", Checks.Select(c => c.Statistic)),
        new DoubleDataFrameColumn("value", Checks.Select(c => c.Value)),
        new StringDataFrameColumn("level", Checks.Select(c => c.Level.ToString())),
        new StringDataFrameColumn("verdict", Checks.Select(c => c.Verdict)));
}
