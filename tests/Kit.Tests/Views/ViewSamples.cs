using Kit.Common;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Training;

namespace Kit.Tests.Views;

/// <summary>
/// Seeded, invented records for the view tests (not a reference: the views are checked against the records
/// they were given). One class name and one text are hostile markup, so every view is exercised with it.
/// </summary>
internal sealed class ViewSamples
{
    public const string Hostile = "</script><b>bold</b>";
    public static readonly string[] Names = { "alpha", "beta", Hostile };

    public int[] Labels { get; }
    public double[][] Probabilities { get; }
    public double[][] Logits { get; }
    public string[] Texts { get; }
    public int[] Lengths { get; }
    public ClassificationMetrics Metrics { get; }

    public ViewSamples(int n = 240, ulong seed = 7)
    {
        var rng = new SplitMix64(seed);
        Labels = new int[n];
        Logits = new double[n][];
        Texts = new string[n];
        Lengths = new int[n];
        for (int i = 0; i < n; i++)
        {
            Labels[i] = rng.NextInt(Names.Length);
            Logits[i] = Enumerable.Range(0, Names.Length).Select(c => 2.5 * rng.NextGaussian() + (c == Labels[i] ? 2.0 : 0)).ToArray();
            Lengths[i] = 3 + rng.NextInt(38);
            Texts[i] = i == 5 ? Hostile + ".example" : $"host{i:D3}-{new string((char)('a' + Labels[i]), Lengths[i] % 7 + 1)}.example";
        }
        Probabilities = TemperatureScaling.Apply(Logits, 1);
        Metrics = ClassificationMetrics.Compute(Labels, Probabilities, Names);
    }

    public LabelledTable Table()
    {
        // Row 1 repeats row 0's text so the leakage audit has something to find when they land in different parts.
        var texts = Texts.ToArray();
        texts[1] = texts[0];
        return new LabelledTable("samples.csv", texts, Labels.Select(l => Names[l]).ToArray(), Texts.Select((_, i) => $"g{i}").ToArray());
    }

    public LengthBreakdown ByLength() => LengthBreakdown.Compute(Labels, Metrics.Predicted, Lengths, Names, LengthBins.Quantiles(5));

    public CalibrationReport Calibration(BinningScheme scheme = BinningScheme.EqualWidth) =>
        CalibrationReport.Compute(Labels, Probabilities, Names, 10, scheme, bootstrap: 50, seed: 3);

    public TemperatureReport Temperature()
    {
        int half = Labels.Length / 2;
        return TemperatureReport.Compute(Logits[..half], Labels[..half], Logits[half..], Labels[half..], Names, 10);
    }

    public ErrorAnalysis Errors() => ErrorAnalysis.Compute(Labels, Probabilities, Texts, Names, top: 8);

    public Projection Sequences(ProjectionMethod method = ProjectionMethod.Pca)
    {
        var rng = new SplitMix64(11);
        var x = Labels.Select(l => Enumerable.Range(0, 6).Select(d => rng.NextGaussian() + (d == l ? 3 : 0)).ToArray()).ToArray();
        return Projection.OfSequences(x, Labels, Names, method, Metrics.Predicted, Texts,
            new TsneOptions { Iterations = 120, ExaggerationIterations = 50, MomentumSwitchIteration = 50, Perplexity = 10 });
    }

    public static Projection Tokens()
    {
        var rng = new SplitMix64(5);
        string[] tokens = { "a", "b", "c", "d", "1", "2", ".", "-", " ", Hostile };
        return Projection.OfTokens(tokens.Select(_ => Enumerable.Range(0, 4).Select(_ => rng.NextGaussian()).ToArray()).ToArray(), tokens, ProjectionMethod.Pca);
    }

    public static TrainingHistory History()
    {
        var h = new TrainingHistory { BestEpoch = 2 };
        h.Epochs.Add(new EpochRecord(1, 1.0, 0.50, 0.9, 0.55, 1e-3, 1.0, 100));
        h.Epochs.Add(new EpochRecord(2, 0.7, 0.70, 0.6, 0.72, 1e-3, 1.0, 100));
        h.Epochs.Add(new EpochRecord(3, 0.5, 0.80, 0.65, 0.70, 1e-3, 1.0, 100));
        return h;
    }

    /// <summary>
    /// Occlusion with a scorer whose answer is known: p(target) = 0.2 + 0.1 × (count of token 7), so hiding a 7
    /// drops it by exactly 0.1 and hiding anything else changes nothing.
    /// </summary>
    public static OcclusionResult Occlusion(out string[] pieces)
    {
        int[] tokens = { 7, 3, 7, 4, 1 };
        pieces = new[] { "x", "<", "x", "&", Hostile };
        Func<int[][], double[][]> score = batch => batch.Select(s =>
        {
            double p = 0.2 + 0.1 * s.Count(t => t == 7);
            return new[] { p, 1 - p, 0.0 };
        }).ToArray();
        return Kit.Diagnostics.Occlusion.Compute(tokens, score, Vocabulary.UnknownId, 0, pieces);
    }
}
