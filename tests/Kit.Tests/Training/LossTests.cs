using Kit.Training;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Training;

/// <summary>The training loss against its definition, computed by hand in double precision.</summary>
public class LossTests
{
    static readonly double[][] Z =
    {
        new[] { 2.0, -1.0, 0.5 },
        new[] { 0.1, 0.2, 3.0 },
        new[] { -2.0, 1.5, 1.0 },
        new[] { 0.0, 0.0, 0.0 },
    };
    static readonly long[] Y = { 0, 2, 0, 1 };

    static double Hand(double[]? w, double eps)
    {
        double num = 0, den = 0;
        for (int i = 0; i < Z.Length; i++)
        {
            double max = Z[i].Max();
            double logSum = max + Math.Log(Z[i].Sum(z => Math.Exp(z - max)));
            int k = Z[i].Length;
            double row = 0;
            for (int c = 0; c < k; c++)
            {
                double q = (c == Y[i] ? 1 - eps : 0) + eps / k;
                row -= q * (Z[i][c] - logSum);
            }
            double wi = w is null ? 1 : w[Y[i]];
            num += wi * row;
            den += wi;
        }
        return num / den;
    }

    static double Ours(double[]? w, double eps)
    {
        Kit.Native.Engine.EnsureLoaded();
        using var loss = new TrainingLoss(w, eps);
        using var logits = torch.tensor(Z.SelectMany(r => r.Select(v => (float)v)).ToArray(), new long[] { Z.Length, 3 });
        using var labels = torch.tensor(Y);
        using var value = loss.Compute(logits, labels);
        return value.item<float>();
    }

    [Fact]
    public void Plain_cross_entropy_matches_the_definition() => Assert.Equal(Hand(null, 0), Ours(null, 0), 5);

    [Fact]
    public void Weighted_cross_entropy_matches_the_definition()
    {
        var w = new[] { 0.5, 3.0, 1.25 };
        double expected = Hand(w, 0);
        Assert.Equal(expected, Ours(w, 0), 5);
        Assert.NotEqual(Hand(null, 0), expected, 3);
    }

    [Fact]
    public void Weighted_cross_entropy_agrees_with_the_engine_weighted_mean()
    {
        // PyTorch/TorchSharp cross_entropy(weight=w, reduction=mean) divides by the summed target weights
        // (torch.nn.CrossEntropyLoss documentation) — the same definition as ours.
        var w = new[] { 0.5, 3.0, 1.25 };
        using var logits = torch.tensor(Z.SelectMany(r => r.Select(v => (float)v)).ToArray(), new long[] { Z.Length, 3 });
        using var weight = torch.tensor(w.Select(v => (float)v).ToArray());
        using var reference = nn.functional.cross_entropy(logits, torch.tensor(Y), weight);
        Assert.Equal(reference.item<float>(), Ours(w, 0), 5);
    }

    [Fact]
    public void Label_smoothing_matches_the_definition()
    {
        double expected = Hand(null, 0.2);
        Assert.Equal(expected, Ours(null, 0.2), 5);
        Assert.NotEqual(Hand(null, 0), expected, 3);
    }

    [Fact]
    public void Label_smoothing_agrees_with_the_engine_without_weights()
    {
        // torch.nn.functional.cross_entropy(label_smoothing=ε) mixes the one-hot target with the uniform
        // distribution, as in Szegedy et al. (2016), section 7.
        using var logits = torch.tensor(Z.SelectMany(r => r.Select(v => (float)v)).ToArray(), new long[] { Z.Length, 3 });
        using var reference = nn.functional.cross_entropy(logits, torch.tensor(Y), label_smoothing: 0.2);
        Assert.Equal(reference.item<float>(), Ours(null, 0.2), 5);
    }

    [Fact]
    public void Weights_and_smoothing_together_match_the_definition() =>
        Assert.Equal(Hand(new[] { 2.0, 0.25, 1.0 }, 0.1), Ours(new[] { 2.0, 0.25, 1.0 }, 0.1), 5);

    [Fact]
    public void Inverse_frequency_weights_follow_the_balanced_rule()
    {
        // scikit-learn compute_class_weight("balanced"): n_samples / (n_classes * bincount(y)).
        // For y = [0, 0, 0, 1, 2, 2] that is 6/(3·3), 6/(3·1), 6/(3·2).
        var w = ClassWeightsFrom.InverseFrequency(new[] { 0, 0, 0, 1, 2, 2 }, 3);
        Assert.Equal(new[] { 6.0 / 9, 2.0, 1.0 }, w);
        Assert.Equal(new[] { 1.0, 1.0, 0.0 }, ClassWeightsFrom.InverseFrequency(new[] { 0, 1 }, 3).Select(v => v * 1.5));
    }
}
