using Kit.Common;
using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class CalibrationReportTests
{
    // Eight predictions over three classes: (top-label confidence, was the top label right?).
    static readonly (double Confidence, bool Correct)[] Worked =
    [
        (0.95, true), (0.85, true), (0.90, false), (0.65, true), (0.70, false), (0.45, false), (0.55, true), (0.60, true),
    ];

    static (int[] Labels, double[][] Probabilities) FromWorked()
    {
        // The prediction is always class 0; a wrong one has true class 1.
        var probs = Worked.Select(w => Samples.Peak(3, 0, w.Confidence)).ToArray();
        var labels = Worked.Select(w => w.Correct ? 0 : 1).ToArray();
        return (labels, probs);
    }

    // Guo et al. (2017), "On Calibration of Modern Neural Networks", eq. 3 (ECE) and eq. 5 (MCE) with bins
    // ((m−1)/M, m/M], worked by hand for M = 5:
    //   (0.4, 0.6]: 0.45 0.55 0.60 -> conf 0.5333, acc 2/3, |gap| 0.1333, weight 3/8
    //   (0.6, 0.8]: 0.65 0.70      -> conf 0.675,  acc 1/2, |gap| 0.175,  weight 2/8
    //   (0.8, 1.0]: 0.85 0.90 0.95 -> conf 0.9,    acc 2/3, |gap| 0.2333, weight 3/8
    //   ECE = 0.05 + 0.04375 + 0.0875 = 0.18125; MCE = 0.2333.
    [Fact]
    public void Equal_width_bins_and_ECE_match_the_hand_worked_example()
    {
        var (labels, probs) = FromWorked();
        var r = CalibrationReport.Compute(labels, probs, Samples.Classes(3), bins: 5, bootstrap: 0);
        Assert.Equal([0, 0, 3, 2, 3], r.BinCounts.ToArray());
        Assert.Equal(1.6 / 3, r.Bins[2].MeanConfidence, 12);
        Assert.Equal(2.0 / 3, r.Bins[2].Accuracy, 12);
        Assert.Equal(0.675, r.Bins[3].MeanConfidence, 12);
        Assert.Equal(0.6, r.Bins[3].Lo, 12);
        Assert.Equal(0.8, r.Bins[3].Hi, 12);
        Assert.True(double.IsNaN(r.Bins[0].Accuracy));
        Assert.Equal(0.18125, r.Ece, 12);
        Assert.Equal(0.9 - 2.0 / 3, r.Mce, 12);
        Assert.True(double.IsNaN(r.EceInterval.Low));
        var frame = r.ToDataFrame();
        Assert.Equal(5, frame.Rows.Count);
        Assert.Equal(3, (int)frame["Count"][4]!);
        Assert.Equal(2.0 / 3 - 0.9, (double)frame["Gap"][4]!, 12);
        Assert.Equal(0.18125, (double)r.SummaryToDataFrame()["Value"][0]!, 12);
    }

    // Equal-mass (adaptive) bins, Nixon et al. (2019), with 4 bins of 2 in confidence order, by hand:
    //   {0.45✗, 0.55✓} gap 0; {0.60✓, 0.65✓} gap 0.375; {0.70✗, 0.85✓} gap 0.275; {0.90✗, 0.95✓} gap 0.425
    //   ECE = (0 + 0.375 + 0.275 + 0.425) / 4 = 0.26875.
    [Fact]
    public void Equal_mass_bins_match_the_hand_worked_example()
    {
        var (labels, probs) = FromWorked();
        var r = CalibrationReport.Compute(labels, probs, Samples.Classes(3), bins: 4, scheme: BinningScheme.EqualMass, bootstrap: 0);
        Assert.Equal([2, 2, 2, 2], r.BinCounts.ToArray());
        Assert.Equal(0.60, r.Bins[1].Lo, 12);
        Assert.Equal(0.65, r.Bins[1].Hi, 12);
        Assert.Equal(0.26875, r.Ece, 12);
        Assert.Equal(0.425, r.Mce, 12);
    }

    // Classwise ECE (Kull et al. 2019, "Beyond temperature scaling", the mean over classes of each class's
    // ECE), by hand for two classes and two bins: p(class 1) = 0.2, 0.4, 0.7, 0.9 with labels 0, 1, 1, 1.
    //   class 1: (0, 0.5]: conf 0.3, freq 1/2; (0.5, 1]: conf 0.8, freq 1 -> ECE 0.2
    //   class 0: (0, 0.5]: conf 0.2, freq 0;   (0.5, 1]: conf 0.7, freq 1/2 -> ECE 0.2
    //   top label: all four in (0.5, 1], conf 0.75, accuracy 3/4 -> ECE 0. A good top-label ECE can hide
    //   miscalibrated class probabilities, which is why both are reported.
    [Fact]
    public void Classwise_ECE_sees_what_top_label_ECE_misses()
    {
        double[][] probs = [[0.8, 0.2], [0.6, 0.4], [0.3, 0.7], [0.1, 0.9]];
        var r = CalibrationReport.Compute([0, 1, 1, 1], probs, ["neg", "pos"], bins: 2, bootstrap: 0);
        Assert.Equal(0, r.Ece, 12);
        Assert.Equal(0.2, r.PerClass[1].Ece, 12);
        Assert.Equal(0.2, r.PerClass[0].Ece, 12);
        Assert.Equal(0.2, r.ClasswiseEce, 12);
        Assert.Equal(0.3, r.PerClass[1].Bins[0].MeanConfidence, 12);
        Assert.Equal(0.5, r.PerClass[1].Bins[0].Accuracy, 12);
        var frame = r.ClasswiseToDataFrame();
        Assert.Equal(4, frame.Rows.Count);
        Assert.Equal("pos", frame["Class"][2]);
        Assert.Equal(1, (int)frame["Bin"][3]!);
    }

    [Fact]
    public void Labels_drawn_from_the_probabilities_are_well_calibrated()
    {
        var (_, probs) = Samples.Random(20000, 4, seed: 5);
        var rng = new SplitMix64(99);
        var labels = probs.Select(p => Draw(p, rng)).ToArray();
        var r = CalibrationReport.Compute(labels, probs, Samples.Classes(4), bootstrap: 200);
        Assert.InRange(r.Ece, 0, 0.02);
        Assert.InRange(r.ClasswiseEce, 0, 0.02);
        Assert.True(r.EceInterval.Low <= r.EceInterval.High);
        Assert.InRange(r.EceInterval.High, 0, 0.03);
    }

    [Fact]
    public void Bootstrap_interval_covers_a_known_gap_and_repeats_with_its_seed()
    {
        // Confidence in [0.85, 0.95], correct with probability confidence − 0.3: every bin is off by 0.3.
        var rng = new SplitMix64(7);
        int n = 3000;
        var probs = new double[n][];
        var labels = new int[n];
        for (int i = 0; i < n; i++)
        {
            double c = 0.85 + 0.1 * rng.NextDouble();
            probs[i] = Samples.Peak(3, 0, c);
            labels[i] = rng.NextDouble() < c - 0.3 ? 0 : 2;
        }
        var r = CalibrationReport.Compute(labels, probs, Samples.Classes(3), bootstrap: 500, seed: 3);
        Assert.InRange(0.3, r.EceInterval.Low, r.EceInterval.High);
        Assert.InRange(r.EceInterval.High - r.EceInterval.Low, 0.01, 0.1);
        var again = CalibrationReport.Compute(labels, probs, Samples.Classes(3), bootstrap: 500, seed: 3);
        Assert.Equal(r.EceInterval, again.EceInterval);
        var other = CalibrationReport.Compute(labels, probs, Samples.Classes(3), bootstrap: 500, seed: 4);
        Assert.NotEqual(r.EceInterval, other.EceInterval);
    }

    [Fact]
    public void Bad_arguments_are_rejected()
    {
        var names = Samples.Classes(2);
        Assert.Throws<ArgumentOutOfRangeException>(() => CalibrationReport.Compute([0], [[0.5, 0.5]], names, bins: 0));
        Assert.Throws<ArgumentOutOfRangeException>(() => CalibrationReport.Compute([0], [[0.5, 0.5]], names, bootstrap: -1));
        var e = Assert.Throws<ArgumentException>(() => CalibrationReport.Compute([0], [[2.0, -1.0]], names));
        Assert.Contains("probabilities[0][0] = 2", e.Message);
    }

    static int Draw(double[] p, SplitMix64 rng)
    {
        double u = rng.NextDouble(), run = 0;
        for (int c = 0; c < p.Length; c++) { run += p[c]; if (u < run) return c; }
        return p.Length - 1;
    }

    internal static int DrawFrom(double[] p, SplitMix64 rng) => Draw(p, rng);
}
