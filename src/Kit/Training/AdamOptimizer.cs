using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// Adam (Kingma &amp; Ba, 2015, Algorithm 1) with ε added to the bias-corrected √v̂, as the engine's own Adam does.
/// Weight decay is either an L2 term added to the gradient (Adam) or decoupled: θ ← θ(1 − η·λ) before the Adam
/// step (AdamW, Loshchilov &amp; Hutter, 2019, Algorithm 2 with the schedule multiplier folded into η).
/// </summary>
public sealed class AdamOptimizer : ParameterOptimizer
{
    public double Beta1 { get; }
    public double Beta2 { get; }
    public double Epsilon { get; }
    public double WeightDecay { get; }
    public bool Decoupled { get; }

    public AdamOptimizer(IEnumerable<(string Name, Tensor Value)> parameters, double weightDecay = 0, bool decoupled = false,
        double beta1 = 0.9, double beta2 = 0.999, double epsilon = 1e-8) : base(parameters)
    {
        WeightDecay = weightDecay;
        Decoupled = decoupled;
        Beta1 = beta1;
        Beta2 = beta2;
        Epsilon = epsilon;
    }

    protected override void Update(string name, Tensor p, Tensor g, double lr)
    {
        if (WeightDecay > 0)
        {
            if (Decoupled) p.mul_(1 - lr * WeightDecay);
            else g = g.add(p, alpha: WeightDecay);
        }
        var m = State("m", name, p, out _);
        var v = State("v", name, p, out _);
        m.mul_(Beta1).add_(g, alpha: 1 - Beta1);
        v.mul_(Beta2).addcmul_(g, g, value: 1 - Beta2);
        double correction1 = 1 - Math.Pow(Beta1, Steps);
        double correction2 = 1 - Math.Pow(Beta2, Steps);
        using var denominator = v.sqrt().div_(Math.Sqrt(correction2)).add_(Epsilon);
        p.addcdiv_(m, denominator, value: -lr / correction1);
        if (WeightDecay > 0 && !Decoupled) g.Dispose();
    }
}
