using Kit.Common;
using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class TemperatureScalingTests
{
    /// <summary>Labels drawn from softmax(z); the model reports z·T, i.e. it is miscalibrated by temperature T exactly.</summary>
    static (double[][] Logits, int[] Labels) AtTemperature(int n, int k, double t, ulong seed)
    {
        var rng = new SplitMix64(seed);
        var logits = new double[n][];
        var labels = new int[n];
        for (int i = 0; i < n; i++)
        {
            var z = new double[k];
            for (int c = 0; c < k; c++) z[c] = 1.5 * rng.NextGaussian();
            labels[i] = CalibrationReportTests.DrawFrom(TemperatureScaling.Softmax(z, 1), rng);
            logits[i] = z.Select(v => v * t).ToArray();
        }
        return (logits, labels);
    }

    // Method: Guo et al. (2017), section 4.2. The check follows from its definition: if the labels follow
    // softmax(z) and the logits are z·T, the NLL-optimal temperature is T, so the fit must recover it
    // (within 2 %, the tolerance the issue sets; the sampling error at n = 20,000 is well below that).
    [Theory]
    [InlineData(2.5, 11UL)]
    [InlineData(0.6, 12UL)]
    [InlineData(1.0, 13UL)]
    public void Recovers_the_temperature_the_logits_were_made_at(double t, ulong seed)
    {
        var (logits, labels) = AtTemperature(20000, 6, t, seed);
        double fitted = TemperatureScaling.Fit(logits, labels);
        Assert.InRange(fitted / t, 0.98, 1.02);
        // It is a minimum of the NLL: nudging T either way costs likelihood.
        double best = TemperatureScaling.NegativeLogLikelihood(logits, labels, fitted);
        Assert.True(TemperatureScaling.NegativeLogLikelihood(logits, labels, fitted * 1.01) > best);
        Assert.True(TemperatureScaling.NegativeLogLikelihood(logits, labels, fitted / 1.01) > best);
    }

    [Fact]
    public void Report_shows_lower_ECE_and_NLL_on_the_test_split_after_scaling()
    {
        var (valLogits, valLabels) = AtTemperature(8000, 4, 3.0, 21);
        var (testLogits, testLabels) = AtTemperature(8000, 4, 3.0, 22);
        var r = TemperatureReport.Compute(valLogits, valLabels, testLogits, testLabels, Samples.Classes(4));
        Assert.InRange(r.T, 2.8, 3.2);
        Assert.False(r.AtSearchBound);
        Assert.True(r.TestNllAfter < r.TestNllBefore);
        Assert.True(r.ValidationNllAfter <= r.ValidationNllBefore);
        Assert.True(r.TestEceAfter < r.TestEceBefore / 3, $"ECE {r.TestEceBefore} -> {r.TestEceAfter}");
        var frame = r.ToDataFrame();
        Assert.Equal(7, frame.Rows.Count);
        Assert.Equal(r.TestEceAfter, (double)frame["Value"][5]!);
    }

    [Fact]
    public void Apply_is_a_stable_softmax_of_the_scaled_logits()
    {
        var p = TemperatureScaling.Apply([[1000.0, 1001.0, 999.0], [0.0, Math.Log(3), 0.0]], 1);
        Assert.Equal(1, p[0].Sum(), 12);
        Assert.Equal(Math.Exp(1) / (1 + Math.Exp(1) + Math.Exp(-1)), p[0][1], 12);
        Assert.Equal(0.6, p[1][1], 12);
        var hot = TemperatureScaling.Apply([[0.0, Math.Log(3), 0.0]], 2)[0];
        Assert.Equal(Math.Sqrt(3) / (2 + Math.Sqrt(3)), hot[1], 12);
    }

    [Fact]
    public void Separable_validation_data_ends_at_the_search_bound()
    {
        // Every example right with a margin: sharper is always better, so the optimum is T -> 0.
        double t = TemperatureScaling.Fit([[5.0, 0.0], [0.0, 5.0]], [0, 1]);
        Assert.Equal(TemperatureScaling.MinTemperature, t);
    }

    [Fact]
    public void Bad_input_is_rejected()
    {
        Assert.Throws<ArgumentException>(() => TemperatureScaling.Fit([[1.0, 2.0]], [0, 1]));
        Assert.Throws<ArgumentOutOfRangeException>(() => TemperatureScaling.Fit([[1.0, 2.0]], [2]));
        Assert.Throws<ArgumentException>(() => TemperatureScaling.Fit([[1.0, double.PositiveInfinity]], [0]));
        Assert.Throws<ArgumentOutOfRangeException>(() => TemperatureScaling.Apply([[1.0, 2.0]], 0));
        Assert.Throws<ArgumentException>(() => TemperatureScaling.Fit([[1.0, 2.0], [1.0]], [0, 0]));
    }
}
