using Kit.Batching;
using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Models;

/// <summary>
/// A small Transformer encoder (Vaswani et al. 2017): a linear map from the embedding to the model width, added
/// positions (sinusoidal, §3.5, or a learned table), then <see cref="ClassifierConfig.Layers"/> blocks of
/// self-attention and a ReLU feed-forward layer, each inside a residual connection. Layer normalisation sits
/// before each sub-layer with one more at the end (the "pre-LN" order of Xiong et al. 2020, which trains without
/// the warm-up the original order needs). Dropout (<see cref="ClassifierConfig.LayerDropout"/>) follows each
/// sub-layer, as in the paper.
///
/// Attention never reads a pad key, and every other step works per position, so a row's outputs at its valid
/// steps do not depend on how long the batch around it is. Outputs at pad steps are zeroed.
/// </summary>
public sealed class TransformerEncoder : nn.Module<Tensor, Tensor, Tensor>
{
    readonly Linear input;
    readonly Embedding? positions;
    readonly ModuleList<TransformerBlock> blocks;
    readonly LayerNorm final_norm;
    readonly Dropout dropout;
    readonly int _width;
    readonly int _maxPositions;

    public TransformerEncoder(ClassifierConfig config) : base(nameof(TransformerEncoder))
    {
        _width = config.HiddenSize;
        _maxPositions = config.MaxPositions;
        input = nn.Linear(config.EmbeddingSize, config.HiddenSize);
        if (config.Positions == PositionKind.Learned) positions = nn.Embedding(config.MaxPositions, config.HiddenSize);
        blocks = new ModuleList<TransformerBlock>();
        for (int i = 0; i < config.Layers; i++) blocks.Add(new TransformerBlock(config.HiddenSize, config.Heads, config.FeedForwardSize, config.LayerDropout));
        final_norm = nn.LayerNorm(config.HiddenSize);
        dropout = nn.Dropout(config.LayerDropout);
        RegisterComponents();
    }

    public IReadOnlyList<TransformerBlock> Blocks => blocks.ToList();

    public override Tensor forward(Tensor embedded, Tensor lengths)
    {
        using var scope = torch.NewDisposeScope();
        long steps = embedded.shape[1];
        if (positions is not null && steps > _maxPositions)
            throw new ArgumentException($"the batch has {steps} steps but the learned position table holds {_maxPositions}");
        var valid = Alignment.ValidMask(lengths, steps, embedded.device);                     // [B, T]
        var x = input.call(embedded).add(PositionTable(steps, embedded.device, embedded.dtype).unsqueeze(0));
        x = dropout.call(x);
        foreach (var block in blocks) x = block.call(x, valid);
        x = final_norm.call(x);
        return x.masked_fill(valid.unsqueeze(-1).logical_not(), 0.0).MoveToOuterDisposeScope();
    }

    /// <summary>Position vectors [T, D]: the learned table's first rows, or PE(p, 2i) = sin(p / 10000^(2i/D)), PE(p, 2i+1) = cos(…).</summary>
    public Tensor PositionTable(long steps, Device device, ScalarType dtype)
    {
        if (positions is not null) return positions.call(torch.arange(steps, ScalarType.Int64, device));
        return Sinusoids(steps, _width).to(dtype).to(device);
    }

    /// <summary>The fixed sinusoidal positions of Vaswani et al. (2017, §3.5), [steps, width].</summary>
    public static Tensor Sinusoids(long steps, int width)
    {
        var table = new float[steps * width];
        for (long p = 0; p < steps; p++)
            for (int i = 0; i < width; i++)
            {
                double angle = p / Math.Pow(10000, 2 * (i / 2) / (double)width);
                table[p * width + i] = (float)(i % 2 == 0 ? Math.Sin(angle) : Math.Cos(angle));
            }
        return torch.tensor(table, new[] { steps, (long)width });
    }
}

/// <summary>One pre-LN Transformer block: x + Dropout(Attention(LN(x))), then y + Dropout(FeedForward(LN(y))).</summary>
public sealed class TransformerBlock : nn.Module<Tensor, Tensor, Tensor>
{
    readonly LayerNorm attention_norm, feed_norm;
    readonly SelfAttention attention;
    readonly Linear feed_in, feed_out;
    readonly Dropout dropout;

    public TransformerBlock(int width, int heads, int feedForward, double dropoutRate) : base(nameof(TransformerBlock))
    {
        attention_norm = nn.LayerNorm(width);
        attention = new SelfAttention(width, heads);
        feed_norm = nn.LayerNorm(width);
        feed_in = nn.Linear(width, feedForward);
        feed_out = nn.Linear(feedForward, width);
        dropout = nn.Dropout(dropoutRate);
        RegisterComponents();
    }

    public SelfAttention Attention => attention;

    public override Tensor forward(Tensor x, Tensor valid)
    {
        using var scope = torch.NewDisposeScope();
        var y = x.add(dropout.call(attention.call(attention_norm.call(x), valid)));
        var z = y.add(dropout.call(feed_out.call(nn.functional.relu(feed_in.call(feed_norm.call(y))))));
        return z.MoveToOuterDisposeScope();
    }
}
