using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// Cross-entropy with optional class weights and label smoothing, defined as
/// q_i = (1 − ε)·onehot(y_i) + ε/K,  ℓ_i = −Σ_k q_ik log softmax(z_i)_k,  loss = Σ_i w_{y_i} ℓ_i / Σ_i w_{y_i}.
/// Each row is weighted by its true class, so the weighted mean stays a mean. With neither option it is the plain
/// mean cross-entropy and uses the engine's fused kernel.
/// </summary>
public sealed class TrainingLoss : IDisposable
{
    readonly Tensor? _weights;
    public double Smoothing { get; }
    public IReadOnlyList<double>? Weights { get; }

    public TrainingLoss(IReadOnlyList<double>? classWeights = null, double smoothing = 0)
    {
        if (!(smoothing >= 0 && smoothing < 1)) throw new ArgumentOutOfRangeException(nameof(smoothing), smoothing, "label smoothing must be in [0, 1)");
        Smoothing = smoothing;
        Weights = classWeights?.ToArray();
        if (classWeights is not null)
        {
            Kit.Native.Engine.EnsureLoaded();
            _weights = torch.tensor(classWeights.Select(w => (float)w).ToArray()).DetachFromDisposeScope();
        }
    }

    public static TrainingLoss For(TrainingOptions options, int[] trainLabels, int classes) =>
        new(options.ClassWeighting switch
        {
            ClassWeighting.None => null,
            ClassWeighting.InverseFrequency => ClassWeightsFrom.InverseFrequency(trainLabels, classes),
            ClassWeighting.Given => CheckCount(options.ClassWeights!, classes),
            _ => throw new ArgumentOutOfRangeException(nameof(options)),
        }, options.LabelSmoothing);

    static IReadOnlyList<double> CheckCount(IReadOnlyList<double> w, int classes) => w.Count == classes ? w
        : throw new ArgumentException($"{w.Count} class weights given for {classes} classes");

    /// <summary>Scalar loss over logits [B, K] and int64 labels [B].</summary>
    public Tensor Compute(Tensor logits, Tensor labels)
    {
        if (_weights is null && Smoothing == 0) return nn.functional.cross_entropy(logits, labels);
        using var scope = torch.NewDisposeScope();
        var logp = nn.functional.log_softmax(logits, 1);
        var perRow = -logp.gather(1, labels.unsqueeze(1)).squeeze(1);
        if (Smoothing > 0) perRow = perRow.mul(1 - Smoothing).sub_(logp.mean(new long[] { 1 }).mul_(Smoothing));
        Tensor loss = _weights is null
            ? perRow.mean()
            : WeightedMean(perRow, _weights.to(logits.device).index_select(0, labels));
        return loss.MoveToOuterDisposeScope();
    }

    static Tensor WeightedMean(Tensor perRow, Tensor rowWeights) => perRow.mul(rowWeights).sum().div(rowWeights.sum());

    public void Dispose() => _weights?.Dispose();
}

/// <summary>Class weights derived from label counts.</summary>
public static class ClassWeightsFrom
{
    /// <summary>
    /// w_c = N / (K · n_c), the "balanced" rule of scikit-learn's compute_class_weight; a class absent from the
    /// labels gets weight 0 (it has no rows to weigh, and an infinite weight would poison the loss).
    /// </summary>
    public static double[] InverseFrequency(int[] labels, int classes)
    {
        var counts = new long[classes];
        foreach (int y in labels)
        {
            if ((uint)y >= (uint)classes) throw new ArgumentOutOfRangeException(nameof(labels), $"label {y} is outside 0..{classes - 1}");
            counts[y]++;
        }
        return counts.Select(n => n == 0 ? 0.0 : labels.Length / (double)(classes * n)).ToArray();
    }
}
