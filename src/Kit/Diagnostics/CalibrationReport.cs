using Kit.Common;
using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Calibration of predicted probabilities: top-label reliability bins with ECE and MCE (Guo et al. 2017,
/// "On Calibration of Modern Neural Networks"), classwise reliability for every class and classwise ECE (the
/// mean over classes of each class's ECE; Kull et al. 2019, "Beyond temperature scaling"), and a percentile
/// bootstrap interval for the top-label ECE, because ECE from a few thousand examples moves by whole points
/// from one split to the next.
/// </summary>
public sealed record CalibrationReport
{
    public required IReadOnlyList<string> ClassNames { get; init; }
    public required BinningScheme Scheme { get; init; }
    public required IReadOnlyList<ReliabilityBin> Bins { get; init; }
    public required double Ece { get; init; }
    public required double Mce { get; init; }
    public required double ClasswiseEce { get; init; }
    public required IReadOnlyList<ClassReliability> PerClass { get; init; }
    /// <summary>2.5 % and 97.5 % percentiles of ECE over bootstrap resamples (NaN when bootstrap = 0).</summary>
    public required (double Low, double High) EceInterval { get; init; }
    public required int BootstrapReplicates { get; init; }
    public required ulong Seed { get; init; }

    public IReadOnlyList<int> BinCounts => Bins.Select(b => b.Count).ToArray();

    public static CalibrationReport Compute(int[] labels, double[][] probabilities, IReadOnlyList<string> classNames,
        int bins = 15, BinningScheme scheme = BinningScheme.EqualWidth, int bootstrap = 1000, ulong seed = 1)
    {
        InputChecks.NotEmpty(labels, nameof(labels));
        ArgumentNullException.ThrowIfNull(probabilities);
        InputChecks.ClassNames(classNames);
        InputChecks.SameLength(labels.Length, nameof(labels), probabilities.Length, nameof(probabilities));
        if (bins < 1) throw new ArgumentOutOfRangeException(nameof(bins), $"bins = {bins}; at least one bin is needed.");
        if (bootstrap < 0) throw new ArgumentOutOfRangeException(nameof(bootstrap), $"bootstrap = {bootstrap} must not be negative (0 skips the interval).");
        if (!Enum.IsDefined(scheme)) throw new ArgumentOutOfRangeException(nameof(scheme), $"unknown binning scheme {scheme}.");
        int n = labels.Length, k = classNames.Count;
        InputChecks.Labels(labels, k);
        InputChecks.Probabilities(probabilities, k);

        var confidence = new double[n];
        var correct = new bool[n];
        for (int i = 0; i < n; i++)
        {
            int top = InputChecks.ArgMax(probabilities[i]);
            confidence[i] = probabilities[i][top];
            correct[i] = top == labels[i];
        }
        var topLabel = new ReliabilityBinning(confidence, correct, bins, scheme);
        var topBins = topLabel.Bins();
        var (ece, mce) = ReliabilityBinning.Errors(topBins);

        var perClass = new ClassReliability[k];
        for (int c = 0; c < k; c++)
        {
            int cls = c;
            var binning = new ReliabilityBinning(probabilities.Select(p => p[cls]).ToArray(), labels.Select(y => y == cls).ToArray(), bins, scheme);
            var classBins = binning.Bins();
            perClass[c] = new ClassReliability(classNames[c], classBins, ReliabilityBinning.Errors(classBins).Ece);
        }

        var interval = (double.NaN, double.NaN);
        if (bootstrap > 0)
        {
            var rng = new SplitMix64(seed);
            var replicates = new double[bootstrap];
            var weights = new int[n];
            for (int r = 0; r < bootstrap; r++)
            {
                Array.Clear(weights);
                for (int i = 0; i < n; i++) weights[rng.NextInt(n)]++;
                replicates[r] = ReliabilityBinning.Errors(topLabel.Bins(weights)).Ece;
            }
            Array.Sort(replicates);
            interval = (Quantile(replicates, 0.025), Quantile(replicates, 0.975));
        }

        return new CalibrationReport
        {
            ClassNames = classNames.ToArray(),
            Scheme = scheme,
            Bins = topBins,
            Ece = ece,
            Mce = mce,
            ClasswiseEce = perClass.Average(c => c.Ece),
            PerClass = perClass,
            EceInterval = interval,
            BootstrapReplicates = bootstrap,
            Seed = seed,
        };
    }

    /// <summary>Linear interpolation between order statistics (Hyndman and Fan 1996, type 7).</summary>
    internal static double Quantile(double[] sorted, double q)
    {
        double h = (sorted.Length - 1) * q;
        int lo = (int)Math.Floor(h);
        return lo + 1 < sorted.Length ? sorted[lo] + (h - lo) * (sorted[lo + 1] - sorted[lo]) : sorted[lo];
    }

    /// <summary>Top-label reliability bins: Bin, Lo, Hi, Count, MeanConfidence, Accuracy, Gap.</summary>
    public DataFrame ToDataFrame() => BinsFrame(Bins, null, Bins.Count);

    /// <summary>Every class's reliability bins stacked, with a Class column first.</summary>
    public DataFrame ClasswiseToDataFrame() =>
        BinsFrame(PerClass.SelectMany(c => c.Bins).ToArray(), PerClass.SelectMany(c => Enumerable.Repeat(c.Class, c.Bins.Count)).ToArray(), Bins.Count);

    /// <summary>Scalar summary: Metric/Value rows (ECE, MCE, classwise ECE, interval bounds).</summary>
    public DataFrame SummaryToDataFrame()
    {
        var rows = new (string, double)[]
        {
            ("ECE", Ece), ("MCE", Mce), ("ClasswiseECE", ClasswiseEce), ("EceLow", EceInterval.Low), ("EceHigh", EceInterval.High),
        };
        return new DataFrame(FrameColumns.Text("Metric", rows.Select(r => r.Item1)), FrameColumns.Number("Value", rows.Select(r => r.Item2)));
    }

    static DataFrame BinsFrame(IReadOnlyList<ReliabilityBin> bins, IReadOnlyList<string>? classes, int binsPerGroup)
    {
        var columns = new List<DataFrameColumn>();
        if (classes is not null) columns.Add(FrameColumns.Text("Class", classes));
        columns.Add(FrameColumns.Count("Bin", bins.Select((_, i) => i % binsPerGroup)));
        columns.Add(FrameColumns.Number("Lo", bins.Select(b => b.Lo)));
        columns.Add(FrameColumns.Number("Hi", bins.Select(b => b.Hi)));
        columns.Add(FrameColumns.Count("Count", bins.Select(b => b.Count)));
        columns.Add(FrameColumns.Number("MeanConfidence", bins.Select(b => b.MeanConfidence)));
        columns.Add(FrameColumns.Number("Accuracy", bins.Select(b => b.Accuracy)));
        columns.Add(FrameColumns.Number("Gap", bins.Select(b => b.Gap)));
        return new DataFrame(columns);
    }
}
