using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Models;

/// <summary>
/// Multi-head scaled dot-product self-attention (Vaswani et al. 2017, "Attention Is All You Need", §3.2):
/// for each head h, softmax(Q_h K_hᵀ / √d_k) V_h with Q = X W_Q + b_Q, K = X W_K + b_K, V = X W_V + b_V split
/// into heads of width d_k = d_model / heads; the heads side by side go through W_O + b_O. Keys at pad steps
/// get −∞ before the softmax, so padding is never attended; every row has at least one valid key.
/// </summary>
public sealed class SelfAttention : nn.Module<Tensor, Tensor, Tensor>
{
    readonly Linear query, key, value, output;
    readonly int _heads;

    public SelfAttention(int width, int heads) : base(nameof(SelfAttention))
    {
        if (heads < 1 || width % heads != 0) throw new ArgumentException($"heads {heads} must divide the width {width}");
        _heads = heads;
        query = nn.Linear(width, width);
        key = nn.Linear(width, width);
        value = nn.Linear(width, width);
        output = nn.Linear(width, width);
        RegisterComponents();
    }

    /// <summary>x [B, T, D] and a bool mask [B, T] (true = real token) → [B, T, D].</summary>
    public override Tensor forward(Tensor x, Tensor valid)
    {
        using var scope = torch.NewDisposeScope();
        return output.call(Mix(x, valid).Output).MoveToOuterDisposeScope();
    }

    /// <summary>Attention weights [B, heads, T (query), T (key)], zero on every pad key.</summary>
    public Tensor Weights(Tensor x, Tensor valid)
    {
        using var scope = torch.NewDisposeScope();
        return Mix(x, valid).Weights.MoveToOuterDisposeScope();
    }

    (Tensor Output, Tensor Weights) Mix(Tensor x, Tensor valid)
    {
        long b = x.shape[0], t = x.shape[1], d = x.shape[2], dk = d / _heads;
        Tensor Heads(Tensor y) => y.view(b, t, _heads, dk).transpose(1, 2);                 // [B, heads, T, d_k]
        var q = Heads(query.call(x));
        var k = Heads(key.call(x));
        var v = Heads(value.call(x));
        var scores = q.matmul(k.transpose(2, 3)).div(Math.Sqrt(dk));                        // [B, heads, T, T]
        var blocked = valid.logical_not().view(b, 1, 1, t);
        var weights = scores.masked_fill(blocked, double.NegativeInfinity).softmax(-1);
        var mixed = weights.matmul(v).transpose(1, 2).contiguous().view(b, t, d);
        return (mixed, weights);
    }
}
