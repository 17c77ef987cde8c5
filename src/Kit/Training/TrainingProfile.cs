using System.Text.Json;
using System.Text.Json.Serialization;

namespace Kit.Training;

/// <summary>
/// A compact picture of the data a model was fitted on, kept in the bundle and the ONNX side-car so score time can
/// say whether new rows look like it. Counted on the validation part (rows the model did not train on, encoded the
/// same way scored rows will be) except the class prior, which counts training labels.
/// <list type="bullet">
/// <item><see cref="LengthCounts"/>: rows by token count before truncation, index = length, the last entry
/// counting every length ≥ its index (the overflow bin).</item>
/// <item><see cref="UnknownTokens"/> of <see cref="KeptTokens"/>: tokens mapped to the unknown id.</item>
/// <item><see cref="ConfidenceCounts"/>: rows by top probability (after temperature), equal-width bins over [0, 1].</item>
/// <item><see cref="PredictedMix"/>: share of validation rows predicted as each class.</item>
/// </list>
/// Holds numbers only; no text leaves the training data.
/// </summary>
public sealed record TrainingProfile(
    int Rows,
    long[] LengthCounts,
    long KeptTokens,
    long UnknownTokens,
    string[] Labels,
    double[] ClassPrior,
    double[] PredictedMix,
    long[] ConfidenceCounts)
{
    public const int FormatVersion = 1;
    public const int ConfidenceBins = 50;

    [JsonIgnore] public double UnknownRate => KeptTokens == 0 ? 0 : UnknownTokens / (double)KeptTokens;
    /// <summary>Lengths at or above this share the last bin.</summary>
    [JsonIgnore] public int LengthCap => LengthCounts.Length - 1;

    /// <summary>The overflow bin sits well past the maximum length, so truncation-heavy drift still shows.</summary>
    public static int CapFor(int maxLength) => Math.Max(8, 2 * maxLength);

    /// <summary>Builds a profile from plain arrays (the validation rows' raw and kept token counts, unknowns, probabilities).</summary>
    public static TrainingProfile From(int maxLength, IReadOnlyList<int> rawLengths, long keptTokens, long unknownTokens,
        IReadOnlyList<string> labels, IReadOnlyList<int> trainLabels, IReadOnlyList<double[]> validationProbabilities)
    {
        int k = labels.Count;
        var prior = new double[k];
        foreach (int y in trainLabels) prior[y]++;
        for (int c = 0; c < k; c++) prior[c] /= Math.Max(1, trainLabels.Count);
        var mix = new double[k];
        var confidence = new long[ConfidenceBins];
        foreach (var p in validationProbabilities)
        {
            int best = 0;
            for (int c = 1; c < p.Length; c++) if (p[c] > p[best]) best = c;
            mix[best]++;
            confidence[ConfidenceBin(p[best])]++;
        }
        for (int c = 0; c < k; c++) mix[c] /= Math.Max(1, validationProbabilities.Count);
        return new TrainingProfile(rawLengths.Count, LengthHistogram(rawLengths, CapFor(maxLength)), keptTokens, unknownTokens,
            labels.ToArray(), prior, mix, confidence);
    }

    public static long[] LengthHistogram(IEnumerable<int> lengths, int cap)
    {
        var counts = new long[cap + 1];
        foreach (int n in lengths) counts[Math.Clamp(n, 0, cap)]++;
        return counts;
    }

    public static int ConfidenceBin(double p) => Math.Clamp((int)(p * ConfidenceBins), 0, ConfidenceBins - 1);

    public static long[] ConfidenceHistogram(IEnumerable<double> confidences)
    {
        var counts = new long[ConfidenceBins];
        foreach (double p in confidences) counts[ConfidenceBin(p)]++;
        return counts;
    }

    sealed record Stored(int Version, int Rows, long[] LengthCounts, long KeptTokens, long UnknownTokens, string[] Labels,
        double[] ClassPrior, double[] PredictedMix, long[] ConfidenceCounts);

    static readonly JsonSerializerOptions Json = new() { PropertyNamingPolicy = JsonNamingPolicy.CamelCase };

    public string ToJson() => JsonSerializer.Serialize(
        new Stored(FormatVersion, Rows, LengthCounts, KeptTokens, UnknownTokens, Labels, ClassPrior, PredictedMix, ConfidenceCounts), Json);

    /// <summary>Reads a profile; <paramref name="source"/> names the file in errors.</summary>
    public static TrainingProfile FromJson(string json, string source)
    {
        Stored? s;
        try
        {
            s = JsonSerializer.Deserialize<Stored>(json, Json);
        }
        catch (JsonException e)
        {
            throw new FormatException($"{source}: training profile is not valid JSON: {e.Message}", e);
        }
        if (s is null) throw new FormatException($"{source}: training profile is empty");
        if (s.Version != FormatVersion) throw new FormatException($"{source}: training profile version {s.Version} is not supported (this build reads {FormatVersion})");
        if (s.LengthCounts is not { Length: >= 2 } || s.ConfidenceCounts?.Length != ConfidenceBins || s.Labels is null
            || s.ClassPrior?.Length != s.Labels.Length || s.PredictedMix?.Length != s.Labels.Length)
            throw new FormatException($"{source}: training profile is malformed (histogram or class lists of the wrong size)");
        return new TrainingProfile(s.Rows, s.LengthCounts, s.KeptTokens, s.UnknownTokens, s.Labels, s.ClassPrior, s.PredictedMix, s.ConfidenceCounts);
    }
}
