using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Training;

/// <summary>
/// An optimiser that owns its state as named tensors, so a checkpoint can store and restore it bit for bit.
/// The learning rate is passed to every step (the schedule lives outside). Updates run without autograd and in place.
/// </summary>
public abstract class ParameterOptimizer : IDisposable
{
    protected readonly (string Name, Tensor Value)[] Parameters;
    readonly Dictionary<string, Tensor> _state = new(StringComparer.Ordinal);

    /// <summary>Steps taken so far (Adam's bias correction depends on it).</summary>
    public long Steps { get; protected set; }

    protected ParameterOptimizer(IEnumerable<(string Name, Tensor Value)> parameters)
    {
        Parameters = parameters.ToArray();
        if (Parameters.Length == 0) throw new ArgumentException("nothing to optimise: no parameters");
    }

    public static ParameterOptimizer Create(TrainingOptions options, IEnumerable<(string Name, Tensor Value)> parameters) => options.Optimizer switch
    {
        OptimizerKind.Adam => new AdamOptimizer(parameters, options.WeightDecay, decoupled: false),
        OptimizerKind.AdamW => new AdamOptimizer(parameters, options.WeightDecay, decoupled: true),
        OptimizerKind.Sgd => new SgdOptimizer(parameters, options.Momentum, options.WeightDecay),
        _ => throw new ArgumentOutOfRangeException(nameof(options), $"unknown optimiser {options.Optimizer}"),
    };

    public void ZeroGrad()
    {
        foreach (var (_, p) in Parameters)
        {
            var g = p.grad;
            if (g is not null) g.zero_();
        }
    }

    public void Step(double learningRate)
    {
        using var noGrad = torch.no_grad();
        Steps++;
        for (int i = 0; i < Parameters.Length; i++)
        {
            var (name, p) = Parameters[i];
            var g = p.grad;
            if (g is null) continue;
            Update(name, p, g, learningRate);
        }
    }

    protected abstract void Update(string name, Tensor parameter, Tensor gradient, double learningRate);

    /// <summary>The state tensor <paramref name="kind"/> of a parameter, created as zeros on first use.</summary>
    protected Tensor State(string kind, string name, Tensor like, out bool created)
    {
        string key = kind + ":" + name;
        created = !_state.TryGetValue(key, out var t);
        if (created) _state[key] = t = torch.zeros_like(like).DetachFromDisposeScope();
        return t!;
    }

    /// <summary>Every state tensor by key (kind:parameter), for checkpoints.</summary>
    public IReadOnlyDictionary<string, Tensor> StateTensors => _state;

    /// <summary>Replaces the state with saved tensors (copied in), e.g. from a checkpoint.</summary>
    public void LoadState(long steps, IReadOnlyDictionary<string, Tensor> state)
    {
        foreach (var t in _state.Values) t.Dispose();
        _state.Clear();
        var names = Parameters.Select(p => p.Name).ToHashSet(StringComparer.Ordinal);
        foreach (var (key, value) in state)
        {
            int colon = key.IndexOf(':');
            if (colon < 0 || !names.Contains(key[(colon + 1)..]))
                throw new InvalidDataException($"optimiser state '{key}' belongs to no parameter of this model");
            _state[key] = value.detach().clone().DetachFromDisposeScope();
        }
        Steps = steps;
    }

    public void Dispose()
    {
        foreach (var t in _state.Values) t.Dispose();
        _state.Clear();
        GC.SuppressFinalize(this);
    }
}
