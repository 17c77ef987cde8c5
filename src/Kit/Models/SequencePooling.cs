using Kit.Batching;
using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Models;

/// <summary>
/// Per-step outputs [B, T, H × directions] of right-padded rows → one vector [B, H × directions] per row. Pad
/// steps are zeroed first and excluded by the mask, so whatever a pad step holds cannot reach the result.
/// Last: the forward half (the whole vector for one-direction encoders) at step length−1 and the backward half at step 0 (where the backward pass ends).
/// Attention: additive scoring v·tanh(W o_t + b) (Bahdanau, Cho and Bengio 2015), softmax over valid steps.
/// </summary>
public sealed class SequencePooling : nn.Module<Tensor, Tensor, Tensor>
{
    readonly PoolingKind _kind;
    readonly int _hidden;
    readonly int _directions;
    readonly Linear? attention_proj;
    readonly Linear? attention_score;

    public SequencePooling(ClassifierConfig config) : base(nameof(SequencePooling))
    {
        _kind = config.Pooling;
        _directions = config.Directions;
        _hidden = config.PooledSize / _directions;
        if (_kind == PoolingKind.Attention)
        {
            attention_proj = nn.Linear(config.PooledSize, config.HiddenSize);
            attention_score = nn.Linear(config.HiddenSize, 1, hasBias: false);
        }
        RegisterComponents();
    }

    public override Tensor forward(Tensor outputs, Tensor lengths)
    {
        using var scope = torch.NewDisposeScope();
        long b = outputs.shape[0], steps = outputs.shape[1];
        var len = lengths.to(ScalarType.Int64).to(outputs.device);
        var mask = Alignment.ValidMask(len, steps, outputs.device);                 // [B, T]
        var valid = mask.unsqueeze(-1);                                                // [B, T, 1]
        var clean = outputs.masked_fill(valid.logical_not(), 0.0);
        Tensor pooled = _kind switch
        {
            PoolingKind.Last => Last(clean, len, b),
            PoolingKind.Mean => clean.sum(1).div(len.unsqueeze(1).to(clean.dtype)),
            PoolingKind.Max => clean.masked_fill(valid.logical_not(), double.NegativeInfinity).max(1).values,
            PoolingKind.Attention => Attend(clean, mask),
            _ => throw new InvalidOperationException($"unknown pooling {_kind}"),
        };
        return pooled.MoveToOuterDisposeScope();
    }

    Tensor Last(Tensor outputs, Tensor len, long b)
    {
        var index = len.sub(1).view(b, 1, 1).expand(b, 1, _hidden);
        var forwardEnd = outputs[.., .., .._hidden].gather(1, index).squeeze(1);
        if (_directions == 1) return forwardEnd;
        var backwardEnd = outputs[.., 0, _hidden..];
        return torch.cat(new[] { forwardEnd, backwardEnd }, 1);
    }

    Tensor Attend(Tensor outputs, Tensor mask) => Weights(outputs, mask).unsqueeze(-1).mul(outputs).sum(1);

    Tensor Weights(Tensor outputs, Tensor mask)
    {
        var scores = attention_score!.call(attention_proj!.call(outputs).tanh()).squeeze(-1);   // [B, T]
        return scores.masked_fill(mask.logical_not(), double.NegativeInfinity).softmax(1);
    }

    /// <summary>Attention weights over steps [B, T] (zero at pads), for inspecting what the model reads.</summary>
    public Tensor AttentionWeights(Tensor outputs, Tensor lengths)
    {
        if (_kind != PoolingKind.Attention) throw new InvalidOperationException("this pooling has no attention weights");
        using var scope = torch.NewDisposeScope();
        var mask = Alignment.ValidMask(lengths, outputs.shape[1], outputs.device);
        var clean = outputs.masked_fill(mask.unsqueeze(-1).logical_not(), 0.0);
        return Weights(clean, mask).MoveToOuterDisposeScope();
    }
}
