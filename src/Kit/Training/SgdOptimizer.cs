using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// Stochastic gradient descent with heavy-ball momentum in the engine's convention: b ← μ·b + g (b = g on the first
/// step), θ ← θ − η·b; weight decay adds λ·θ to g first.
/// </summary>
public sealed class SgdOptimizer : ParameterOptimizer
{
    public double Momentum { get; }
    public double WeightDecay { get; }

    public SgdOptimizer(IEnumerable<(string Name, Tensor Value)> parameters, double momentum = 0.9, double weightDecay = 0) : base(parameters)
    {
        Momentum = momentum;
        WeightDecay = weightDecay;
    }

    protected override void Update(string name, Tensor p, Tensor g, double lr)
    {
        using var decayed = WeightDecay > 0 ? g.add(p, alpha: WeightDecay) : null;
        var d = decayed ?? g;
        if (Momentum > 0)
        {
            var buffer = State("momentum", name, p, out bool created);
            if (created) buffer.copy_(d);
            else buffer.mul_(Momentum).add_(d);
            d = buffer;
        }
        p.add_(d, alpha: -lr);
    }
}
