using Kit.Training;
using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Tests.Training;

public class GradientClippingTests
{
    static Tensor[] Params(float scale)
    {
        Kit.Native.Engine.EnsureLoaded();
        var a = torch.zeros(3, 2).requires_grad_(true);
        var b = torch.zeros(4).requires_grad_(true);
        a.grad = torch.tensor(new[] { 1f, -2f, 3f, 0.5f, -1f, 2f }, new long[] { 3, 2 }).mul(scale);
        b.grad = torch.tensor(new[] { -4f, 1f, 0f, 2.5f }).mul(scale);
        return new[] { a, b };
    }

    static double[] Flat(Tensor[] ps) => ps.SelectMany(p => p.grad!.data<float>().ToArray().Select(v => (double)v)).ToArray();

    [Fact]
    public void Clipping_bounds_the_global_norm_and_keeps_the_direction()
    {
        var ps = Params(10);
        var before = Flat(ps);
        double norm = Math.Sqrt(before.Sum(v => v * v));
        double reported = GradientNorm.Clip(ps, 1.5);
        Assert.Equal(norm, reported, 3);
        var after = Flat(ps);
        double afterNorm = Math.Sqrt(after.Sum(v => v * v));
        Assert.True(afterNorm <= 1.5 + 1e-6, $"norm after clipping is {afterNorm}");
        Assert.True(afterNorm > 1.5 - 1e-4);
        for (int i = 0; i < before.Length; i++) Assert.Equal(before[i] / norm * afterNorm, after[i], 5);
    }

    [Fact]
    public void Small_gradients_are_left_alone()
    {
        var ps = Params(0.01f);
        var before = Flat(ps);
        GradientNorm.Clip(ps, 1.5);
        Assert.Equal(before, Flat(ps));
    }

    [Fact]
    public void Clipping_agrees_with_the_engine_clip_grad_norm()
    {
        // Reference: TorchSharp 0.107.0 torch.nn.utils.clip_grad_norm_ (a port of PyTorch's, same 1e-6 guard).
        var ours = Params(10);
        GradientNorm.Clip(ours, 1.5);
        Kit.Native.Engine.EnsureLoaded();
        var a = new Parameter(torch.zeros(3, 2));
        var b = new Parameter(torch.zeros(4));
        var theirs = Params(10);
        a.grad = theirs[0].grad!.clone();
        b.grad = theirs[1].grad!.clone();
        double total = torch.nn.utils.clip_grad_norm_(new[] { a, b }, 1.5);
        Assert.Equal(GradientNorm.Total(Params(10)), total, 3);
        var expected = a.grad!.data<float>().ToArray().Concat(b.grad!.data<float>().ToArray()).Select(v => (double)v).ToArray();
        var actual = Flat(ours);
        for (int i = 0; i < expected.Length; i++) Assert.Equal(expected[i], actual[i], 5);
    }
}
