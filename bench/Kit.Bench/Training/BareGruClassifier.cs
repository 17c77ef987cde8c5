using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Bench.Training;

/// <summary>
/// The reference model for the ratio benches, written the way a hand-rolled TorchSharp program would: embedding,
/// one batch-first GRU over the padded batch (all rows share one length, so no packing is needed), the final hidden
/// state, one linear layer.
/// </summary>
internal sealed class BareGruClassifier : nn.Module<Tensor, Tensor>
{
    readonly Embedding embedding;
    readonly GRU gru;
    readonly Linear head;

    public BareGruClassifier(int vocabulary, int embed, int hidden, int classes) : base(nameof(BareGruClassifier))
    {
        embedding = nn.Embedding(vocabulary, embed, padding_idx: 0);
        gru = nn.GRU(embed, hidden, batchFirst: true);
        head = nn.Linear(hidden, classes);
        RegisterComponents();
    }

    public override Tensor forward(Tensor tokens)
    {
        using var scope = torch.NewDisposeScope();
        var (_, h) = gru.call(embedding.call(tokens), null);
        return head.call(h[-1]).MoveToOuterDisposeScope();
    }
}
