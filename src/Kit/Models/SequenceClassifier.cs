using Kit.Batching;
using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Models;

/// <summary>
/// Embedding → encoder (recurrent, convolutional or Transformer) → pooling → head. <c>forward(tokens, lengths)</c> takes right-padded int64
/// token ids [B, T] and int64 lengths [B] and returns logits [B, Classes]; <see cref="Logits"/> also takes
/// left-padded batches. The embedding row of the pad id is fixed at zero.
/// </summary>
public sealed class SequenceClassifier : nn.Module<Tensor, Tensor, Tensor>
{
    readonly Embedding embedding;
    readonly Dropout embedding_dropout;
    // One field name for every encoder family, so the weights keep the "encoder." prefix bundles already use.
    readonly nn.Module<Tensor, Tensor, Tensor> encoder;
    readonly SequencePooling pooling;
    readonly Dropout head_dropout;
    readonly Sequential head;

    public ClassifierConfig Config { get; }

    public SequenceClassifier(ClassifierConfig config) : base(nameof(SequenceClassifier))
    {
        Kit.Native.Engine.EnsureLoaded();
        Config = config.Validate();
        var device = ComputeDevice.Resolve(config.Device);
        embedding = nn.Embedding(config.VocabularySize, config.EmbeddingSize, padding_idx: BatchBuilder.PadId);
        embedding_dropout = nn.Dropout(config.EmbeddingDropout);
        encoder = config.Encoder switch
        {
            EncoderKind.Convolution => new ConvolutionEncoder(config),
            EncoderKind.Transformer => new TransformerEncoder(config),
            _ => new RecurrentEncoder(config),
        };
        pooling = new SequencePooling(config);
        head_dropout = nn.Dropout(config.HeadDropout);
        head = config.Head == HeadKind.Linear
            ? nn.Sequential(("linear", nn.Linear(config.PooledSize, config.Classes)))
            : nn.Sequential(
                ("hidden", nn.Linear(config.PooledSize, config.MlpHidden)),
                ("relu", nn.ReLU()),
                ("output", nn.Linear(config.MlpHidden, config.Classes)));
        RegisterComponents();
        if (device.type != DeviceType.CPU) this.to(device);
    }

    /// <summary>The recurrent encoder; throws for the other families (see <see cref="SequenceEncoder"/>).</summary>
    public RecurrentEncoder Encoder => encoder as RecurrentEncoder
        ?? throw new InvalidOperationException($"this classifier's encoder is {Config.Encoder}, not recurrent");

    /// <summary>The encoder whatever its family: embedded batch [B, T, E] and lengths → per-step outputs [B, T, PooledSize].</summary>
    public nn.Module<Tensor, Tensor, Tensor> SequenceEncoder => encoder;
    public SequencePooling Pooling => pooling;

    public override Tensor forward(Tensor tokens, Tensor lengths) => Logits(tokens, lengths, PadSide.Right);

    public Tensor Logits(Tensor tokens, Tensor lengths, PadSide side)
    {
        using var scope = torch.NewDisposeScope();
        var pooled = Pooled(tokens, lengths, side);
        return head.call(head_dropout.call(pooled)).MoveToOuterDisposeScope();
    }

    /// <summary>The pooled sequence representation [B, H × directions] that the head reads.</summary>
    public Tensor Pooled(Tensor tokens, Tensor lengths, PadSide side = PadSide.Right)
    {
        using var scope = torch.NewDisposeScope();
        var outputs = Encode(tokens, lengths, side);
        return pooling.call(outputs, lengths).MoveToOuterDisposeScope();
    }

    /// <summary>
    /// Per-step encoder outputs [B, T, H × directions], always right-aligned (step 0 = first token) whatever
    /// <paramref name="side"/> the input had; pad steps hold no meaning.
    /// </summary>
    public Tensor Encode(Tensor tokens, Tensor lengths, PadSide side = PadSide.Right)
    {
        CheckInput(tokens, lengths, side);
        using var scope = torch.NewDisposeScope();
        var ids = side == PadSide.Left ? Alignment.LeftToRight(tokens, lengths) : tokens;
        var embedded = embedding_dropout.call(embedding.call(ids));
        return encoder.call(embedded, lengths).MoveToOuterDisposeScope();
    }

    /// <summary>A detached copy of the embedding matrix [VocabularySize, EmbeddingSize] on the CPU.</summary>
    public Tensor EmbeddingMatrix() => embedding.weight!.detach().cpu().clone();

    public long ParameterCount() => parameters().Sum(p => p.numel());

    void CheckInput(Tensor tokens, Tensor lengths, PadSide side)
    {
        if (tokens.dim() != 2) throw new ArgumentException($"tokens must be [B, T], got {tokens.dim()} dimension(s)");
        if (tokens.dtype != ScalarType.Int64) throw new ArgumentException($"tokens must be int64, got {tokens.dtype}");
        long b = tokens.shape[0], steps = tokens.shape[1];
        if (lengths.dim() != 1 || lengths.shape[0] != b)
            throw new ArgumentException($"lengths must be [B] = [{b}], got [{string.Join(", ", lengths.shape)}]");
        using var scope = torch.NewDisposeScope();
        var cpuLengths = lengths.cpu();
        long shortest = cpuLengths.min().item<long>(), longest = cpuLengths.max().item<long>();
        if (shortest < 1 || longest > steps) throw new ArgumentException($"every length must be in 1..{steps}, got {shortest}..{longest}");
        // A right-padded row always starts with a real token; a pad id at step 0 of a short row means the batch
        // was padded on the left and would be read backwards-in-time wrongly.
        if (side == PadSide.Right && shortest < steps)
        {
            var shortRows = cpuLengths.lt(steps).to(tokens.device);
            if (tokens[.., 0].eq(BatchBuilder.PadId).logical_and(shortRows).any().item<bool>())
                throw new ArgumentException("tokens look left-padded (pad id at step 0 of a short row); call Logits/Pooled with PadSide.Left");
        }
    }
}
