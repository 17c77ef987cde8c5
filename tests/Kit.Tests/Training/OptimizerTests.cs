using Kit.Training;
using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Tests.Training;

/// <summary>
/// The kit's optimisers against the engine's reference implementations (TorchSharp 0.107.0 torch.optim, a port
/// of PyTorch's Adam, AdamW and SGD), fed identical gradients for several steps.
/// </summary>
public class OptimizerTests
{
    static readonly float[] Start = { 0.5f, -1.25f, 2.0f, 0.0f, -0.3f, 1.1f };

    static float[] Gradient(int step) => Start.Select((_, i) => (float)Math.Sin(1.7 * i + 0.9 * step) * (i + 1) * 0.3f).ToArray();

    static float[] RunKit(Func<(string, Tensor)[], ParameterOptimizer> make, double lr, int steps)
    {
        var p = torch.tensor(Start).requires_grad_(true);
        using var opt = make(new[] { ("w", p) });
        for (int s = 0; s < steps; s++)
        {
            p.grad = torch.tensor(Gradient(s));
            opt.Step(lr);
        }
        return p.detach().data<float>().ToArray();
    }

    static float[] RunReference(Func<Parameter, optim.Optimizer> make, int steps)
    {
        var p = new Parameter(torch.tensor(Start));
        var opt = make(p);
        for (int s = 0; s < steps; s++)
        {
            p.grad = torch.tensor(Gradient(s));
            opt.step();
        }
        return p.detach().data<float>().ToArray();
    }

    static void AssertClose(float[] expected, float[] actual)
    {
        Assert.Equal(expected.Length, actual.Length);
        for (int i = 0; i < expected.Length; i++)
            Assert.True(Math.Abs(expected[i] - actual[i]) <= 1e-5 + 1e-5 * Math.Abs(expected[i]), $"entry {i}: expected {expected[i]}, got {actual[i]}");
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(0.1)]
    public void Adam_matches_the_engine_reference(double decay)
    {
        Kit.Native.Engine.EnsureLoaded();
        var kit = RunKit(ps => new AdamOptimizer(ps, decay, decoupled: false), 0.05, 7);
        var reference = RunReference(p => optim.Adam(new[] { p }, 0.05, weight_decay: decay), 7);
        AssertClose(reference, kit);
    }

    [Fact]
    public void AdamW_matches_the_engine_reference()
    {
        Kit.Native.Engine.EnsureLoaded();
        var kit = RunKit(ps => new AdamOptimizer(ps, 0.2, decoupled: true), 0.05, 7);
        var reference = RunReference(p => optim.AdamW(new[] { p }, 0.05, weight_decay: 0.2), 7);
        AssertClose(reference, kit);
        // Decoupled and coupled decay really are different updates.
        Assert.NotEqual(RunKit(ps => new AdamOptimizer(ps, 0.2, decoupled: false), 0.05, 7), kit);
    }

    [Fact]
    public void Sgd_with_momentum_matches_the_engine_reference()
    {
        Kit.Native.Engine.EnsureLoaded();
        var kit = RunKit(ps => new SgdOptimizer(ps, momentum: 0.9, weightDecay: 0.01), 0.1, 6);
        var reference = RunReference(p => optim.SGD(new[] { p }, 0.1, momentum: 0.9, weight_decay: 0.01), 6);
        AssertClose(reference, kit);
    }

    [Fact]
    public void First_adam_step_moves_each_weight_by_the_learning_rate()
    {
        // Kingma & Ba (2015), section 2.1: with bias correction the first step is lr · g / (|g| + ε̂), i.e. ±lr.
        Kit.Native.Engine.EnsureLoaded();
        var after = RunKit(ps => new AdamOptimizer(ps), 0.01, 1);
        var g = Gradient(0);
        for (int i = 0; i < Start.Length; i++)
            Assert.Equal(Start[i] - 0.01 * Math.Sign(g[i]), after[i], 5);
    }

    [Fact]
    public void Saved_state_continues_exactly()
    {
        Kit.Native.Engine.EnsureLoaded();
        var straight = RunKit(ps => new AdamOptimizer(ps), 0.05, 6);

        var p = torch.tensor(Start).requires_grad_(true);
        var first = new AdamOptimizer(new[] { ("w", p) });
        for (int s = 0; s < 3; s++) { p.grad = torch.tensor(Gradient(s)); first.Step(0.05); }
        var saved = first.StateTensors.ToDictionary(kv => kv.Key, kv => kv.Value.clone());
        long steps = first.Steps;
        first.Dispose();
        using var second = new AdamOptimizer(new[] { ("w", p) });
        second.LoadState(steps, saved);
        for (int s = 3; s < 6; s++) { p.grad = torch.tensor(Gradient(s)); second.Step(0.05); }
        Assert.Equal(straight, p.detach().data<float>().ToArray());
    }
}
