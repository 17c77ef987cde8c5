using System.Security.Cryptography;
using System.Text.Json;
using System.Text.Json.Serialization;

namespace Kit.Experiments;

/// <summary>
/// A sweep as defined in code or on the command line: configs × training seeds × (k folds or the base spec's
/// one holdout split), plus the two n-gram baselines (naive Bayes, logistic regression), which every comparison
/// carries. The baselines are deterministic, so each runs once per fold (with the first seed) and is paired with
/// every seed of the others.
/// </summary>
public sealed record SweepPlan
{
    public required RunSpec Base { get; init; }
    public required IReadOnlyList<SweepConfig> Configs { get; init; }
    /// <summary>Training seeds are Base.Training.Seed, +1, …; the split seed stays fixed so every run of a fold sees the same test items.</summary>
    public int Seeds { get; init; } = 1;
    /// <summary>k for k-fold runs; null runs every config on the base spec's holdout split.</summary>
    public int? Folds { get; init; }
    /// <summary>The baselines' n-grams; null takes the usual scheme for the base spec's tokenizer (<see cref="NgramScheme.ForTokenizer"/>).</summary>
    public NgramScheme? Ngrams { get; init; }
    /// <summary>Additive smoothing of the naive Bayes baseline.</summary>
    public double NaiveBayesSmoothing { get; init; } = NgramBaseline.DefaultSmoothing;
    /// <summary>L2 strength of the logistic regression baseline.</summary>
    public double LinearL2 { get; init; } = NgramBaseline.DefaultL2;

    /// <summary>The n-gram scheme the baselines use.</summary>
    public NgramScheme BaselineNgrams => Ngrams ?? NgramScheme.ForTokenizer(Base.Tokenizer);
    /// <summary>Length bins for the by-length comparison: quantiles of all rows' token counts, shared by every run.</summary>
    public int LengthBins { get; init; } = 5;
    public int CalibrationBins { get; init; } = 10;
    /// <summary>For a search: its space, count, η and budget in words (part of what a results folder must match); null for a grid sweep.</summary>
    public string? Search { get; init; }

    public IReadOnlyList<SweepConfig> AllConfigs => [.. Configs, .. SweepConfig.Baselines];

    /// <summary>How the sweep's data is prepared: the base spec's data settings with this plan's folds.</summary>
    public Kit.Data.PrepareOptions Preparation => Base.Preparation with { Folds = Folds };

    public SweepPlan Validate()
    {
        if (Configs.Count == 0) throw new ArgumentException("a sweep needs at least one config");
        if (Configs.Any(c => c.IsBaseline)) throw new ArgumentException("the baselines are added by the sweep itself; do not list them");
        var dup = Configs.GroupBy(c => c.Name).FirstOrDefault(g => g.Count() > 1);
        if (dup is not null) throw new ArgumentException($"config {dup.Key} is listed twice");
        if (Seeds < 1) throw new ArgumentException($"seeds = {Seeds}; at least one is needed");
        if (Folds is int k && k < 2) throw new ArgumentException($"folds = {k}; k-fold needs k ≥ 2 (leave folds unset for one holdout split)");
        BaselineNgrams.Validate();
        if (!(NaiveBayesSmoothing > 0) || !double.IsFinite(NaiveBayesSmoothing)) throw new ArgumentException($"naive Bayes smoothing {NaiveBayesSmoothing} must be positive");
        if (!(LinearL2 > 0) || !double.IsFinite(LinearL2)) throw new ArgumentException($"logistic regression L2 {LinearL2} must be positive");
        return this;
    }

    /// <summary>Every run, in the fixed order shards are cut from: config, then seed, then fold.</summary>
    public IReadOnlyList<RunKey> Runs()
    {
        int folds = Folds ?? 1;
        var keys = new List<RunKey>();
        foreach (var config in AllConfigs)
            for (int s = 0; s < (config.IsBaseline ? 1 : Seeds); s++)
                for (int f = 1; f <= folds; f++)
                    keys.Add(new RunKey(config.Name, Base.Training.Seed + (ulong)s, f, folds));
        return keys;
    }

    public SweepConfig ConfigNamed(string name) =>
        AllConfigs.FirstOrDefault(c => c.Name == name) ?? throw new ArgumentException($"config '{name}' is not in this sweep");

    /// <summary>
    /// What must match for two processes to share a store folder: the plan minus where the data sits and how
    /// many threads run it, plus a hash of the data file's bytes.
    /// </summary>
    public string Describe(string dataSha256)
    {
        var basis = Base with { DataPath = Path.GetFileName(Base.DataPath), Training = Base.Training with { Threads = 0 } };
        var doc = new
        {
            data_sha256 = dataSha256,
            base_spec = basis,
            configs = AllConfigs.Select(c => c.Name).ToArray(),
            seeds = Seeds,
            folds = Folds,
            ngrams = BaselineNgrams.ToString(),
            naive_bayes_smoothing = NaiveBayesSmoothing,
            linear_l2 = LinearL2,
            length_bins = LengthBins,
            calibration_bins = CalibrationBins,
        };
        // A grid sweep's description is left exactly as it was, so existing folders still match.
        if (Search is null) return JsonSerializer.Serialize(doc, DescribeJson);
        var node = JsonSerializer.SerializeToNode(doc, DescribeJson)!.AsObject();
        node["search"] = Search;
        return node.ToJsonString(DescribeJson);
    }

    public static string Sha256Of(string path)
    {
        using var stream = File.OpenRead(path);
        return Convert.ToHexStringLower(SHA256.HashData(stream));
    }

    static readonly JsonSerializerOptions DescribeJson = new()
    {
        WriteIndented = true,
        Converters = { new JsonStringEnumConverter() },
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
    };

}
