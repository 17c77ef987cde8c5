using Kit.Batching;
using TorchSharp;
using TorchSharp.Modules;
using static TorchSharp.torch;

namespace Kit.Models;

/// <summary>
/// The convolutional encoder of Kim (2014), "Convolutional Neural Networks for Sentence Classification": one 1-D
/// convolution per kernel width over the embedded sequence, ReLU, the widths' filters side by side. Step t of the
/// output reads the window of tokens t … t + w − 1, with zeros past the row's end, so every valid step has a value
/// for every width and rows shorter than the widest kernel still get one. Max pooling over valid steps then gives
/// Kim's max-over-time feature vector.
///
/// Pad steps are zeroed before the convolution, so a row's outputs never depend on how long the batch around it is.
/// The convolution is computed as windows × weights (a matrix product) rather than with the engine's convolution
/// kernel, whose input gradient came back with NaN and ∞ entries on the CPU engine this kit ships with (measured
/// with TorchSharp 0.107 on Debian 12: a third of training steps after dropout before the head).
/// </summary>
public sealed class ConvolutionEncoder : nn.Module<Tensor, Tensor, Tensor>
{
    readonly ModuleList<Linear> convolutions;
    readonly int[] _widths;

    public ConvolutionEncoder(ClassifierConfig config) : base(nameof(ConvolutionEncoder))
    {
        _widths = config.KernelWidths.ToArray();
        convolutions = new ModuleList<Linear>();
        foreach (int w in _widths) convolutions.Add(nn.Linear(config.EmbeddingSize * w, config.HiddenSize));
        RegisterComponents();
    }

    public IReadOnlyList<int> Widths => _widths;

    /// <summary>Embedded right-padded batch [B, T, E] and lengths [B] → per-step features [B, T, filters × widths].</summary>
    public override Tensor forward(Tensor embedded, Tensor lengths)
    {
        using var scope = torch.NewDisposeScope();
        long steps = embedded.shape[1];
        var valid = Alignment.ValidMask(lengths, steps, embedded.device).unsqueeze(-1);
        var x = embedded.masked_fill(valid.logical_not(), 0.0);                                // [B, T, E]
        long b = x.shape[0], e = x.shape[2];
        var features = new List<Tensor>(_widths.Length);
        for (int i = 0; i < _widths.Length; i++)
        {
            int w = _widths[i];
            // Zeros after the last step let the window starting at every step fit, whatever its width.
            var padded = w == 1 ? x : torch.cat(new[] { x, x.new_zeros(b, w - 1, e) }, 1);
            // Each window's w embeddings side by side [B, T, w × E], then one affine map per width: the same
            // arithmetic as a 1-D convolution, done as a matrix product.
            var windows = padded.unfold(1, w, 1).transpose(2, 3).reshape(b, steps, w * e);
            features.Add(nn.functional.relu(convolutions[i].call(windows)));                 // [B, T, F]
        }
        return torch.cat(features, 2).MoveToOuterDisposeScope();
    }
}
