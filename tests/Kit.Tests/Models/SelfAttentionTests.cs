using Kit.Models;
using Kit.Tests.Batching;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Models;

/// <summary>
/// The attention layer against a hand computation of Vaswani et al. (2017), "Attention Is All You Need", §3.2.1–3.2.2
/// (eq. 1: Attention(Q, K, V) = softmax(QKᵀ / √d_k) V; multi-head: Concat(head_1 … head_h) W_O), done here with plain
/// double arrays on a tiny input, and pad keys excluded from the softmax.
/// </summary>
public class SelfAttentionTests
{
    public SelfAttentionTests() => TestEngine.Load();

    const int Width = 4, Heads = 2, Steps = 3;

    /// <summary>A fixed weight pattern, different per matrix, small enough that the softmax is not saturated.</summary>
    static double W(int matrix, int i, int j) => 0.1 * (((i * 3 + j * 5 + matrix * 7) % 9) - 4);
    static double Bias(int matrix, int i) => 0.05 * (((i + 2 * matrix) % 5) - 2);

    static SelfAttention Layer()
    {
        var layer = new SelfAttention(Width, Heads);
        string[] names = ["query", "key", "value", "output"];
        using var noGrad = torch.no_grad();
        var p = layer.named_parameters().ToDictionary(x => x.name, x => x.parameter);
        for (int m = 0; m < 4; m++)
        {
            var w = new float[Width * Width];
            for (int i = 0; i < Width; i++) for (int j = 0; j < Width; j++) w[i * Width + j] = (float)W(m, i, j);
            p[names[m] + ".weight"].copy_(torch.tensor(w, new long[] { Width, Width }));
            p[names[m] + ".bias"].copy_(torch.tensor(Enumerable.Range(0, Width).Select(i => (float)Bias(m, i)).ToArray()));
        }
        return layer;
    }

    static readonly double[][] X = [[0.5, -1.0, 0.25, 2.0], [1.5, 0.0, -0.5, 1.0], [-2.0, 3.0, 1.0, 0.0]];

    /// <summary>y = x Wᵀ + b, as a linear layer computes it.</summary>
    static double[][] Affine(double[][] x, int m) =>
        x.Select(row => Enumerable.Range(0, Width).Select(i => Bias(m, i) + Enumerable.Range(0, Width).Sum(j => W(m, i, j) * row[j])).ToArray()).ToArray();

    /// <summary>Expected output rows and per-head weights for a row whose first <paramref name="length"/> steps are real.</summary>
    static (double[][] Output, double[,,] Weights) ByHand(int length)
    {
        var q = Affine(X, 0); var k = Affine(X, 1); var v = Affine(X, 2);
        int dk = Width / Heads;
        var mixed = new double[Steps][];
        var weights = new double[Heads, Steps, Steps];
        for (int t = 0; t < Steps; t++)
        {
            mixed[t] = new double[Width];
            for (int h = 0; h < Heads; h++)
            {
                var scores = new double[length];
                for (int s = 0; s < length; s++)
                    for (int c = h * dk; c < (h + 1) * dk; c++) scores[s] += q[t][c] * k[s][c] / Math.Sqrt(dk);
                double max = scores.Max(), sum = scores.Sum(z => Math.Exp(z - max));
                for (int s = 0; s < length; s++)
                {
                    double a = Math.Exp(scores[s] - max) / sum;
                    weights[h, t, s] = a;
                    for (int c = h * dk; c < (h + 1) * dk; c++) mixed[t][c] += a * v[s][c];
                }
            }
        }
        return (Affine(mixed, 3), weights);
    }

    [Theory]
    [InlineData(3)]
    [InlineData(2)]
    [InlineData(1)]
    public void Output_and_weights_match_the_published_equations_and_pads_get_no_weight(int length)
    {
        var layer = Layer();
        using var x = torch.tensor(X.SelectMany(r => r.Select(v => (float)v)).ToArray(), new long[] { 1, Steps, Width });
        using var valid = torch.tensor(Enumerable.Range(0, Steps).Select(t => t < length).ToArray(), new long[] { 1, Steps });
        using var noGrad = torch.no_grad();
        using var output = layer.call(x, valid);
        using var weights = layer.Weights(x, valid);
        var (expected, expectedWeights) = ByHand(length);
        var got = ModelProbe.Row(output);
        var gotWeights = ModelProbe.Row(weights);
        // Only the valid query steps matter to the classifier; pads are zeroed later, but every step is checked here.
        for (int t = 0; t < Steps; t++)
            for (int c = 0; c < Width; c++)
                Assert.True(Math.Abs(expected[t][c] - got[t * Width + c]) < 1e-5, $"output[{t},{c}] = {got[t * Width + c]}, by hand {expected[t][c]}");
        for (int h = 0; h < Heads; h++)
            for (int t = 0; t < Steps; t++)
                for (int s = 0; s < Steps; s++)
                {
                    float w = gotWeights[(h * Steps + t) * Steps + s];
                    if (s >= length) Assert.Equal(0f, w);
                    else Assert.True(Math.Abs(expectedWeights[h, t, s] - w) < 1e-6, $"weight[{h},{t},{s}] = {w}, by hand {expectedWeights[h, t, s]}");
                }
    }

    [Fact]
    public void Sinusoidal_positions_follow_section_3_5()
    {
        // PE(p, 2i) = sin(p / 10000^(2i/d)), PE(p, 2i+1) = cos(p / 10000^(2i/d)); d = 6 here.
        using var table = TransformerEncoder.Sinusoids(5, 6);
        var pe = ModelProbe.Row(table);
        for (int p = 0; p < 5; p++)
            for (int i = 0; i < 3; i++)
            {
                double angle = p / Math.Pow(10000, 2.0 * i / 6);
                Assert.True(Math.Abs(Math.Sin(angle) - pe[p * 6 + 2 * i]) < 1e-6, $"PE({p}, {2 * i})");
                Assert.True(Math.Abs(Math.Cos(angle) - pe[p * 6 + 2 * i + 1]) < 1e-6, $"PE({p}, {2 * i + 1})");
            }
        Assert.Equal(0f, pe[0]);
        Assert.Equal(1f, pe[1]);
    }
}
