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
/// </summary>
public sealed class ConvolutionEncoder : nn.Module<Tensor, Tensor, Tensor>
{
    readonly ModuleList<Conv1d> convolutions;
    readonly int[] _widths;

    public ConvolutionEncoder(ClassifierConfig config) : base(nameof(ConvolutionEncoder))
    {
        _widths = config.KernelWidths.ToArray();
        convolutions = new ModuleList<Conv1d>();
        foreach (int w in _widths) convolutions.Add(nn.Conv1d(config.EmbeddingSize, config.HiddenSize, w));
        RegisterComponents();
    }

    public IReadOnlyList<int> Widths => _widths;

    /// <summary>Embedded right-padded batch [B, T, E] and lengths [B] → per-step features [B, T, filters × widths].</summary>
    public override Tensor forward(Tensor embedded, Tensor lengths)
    {
        using var scope = torch.NewDisposeScope();
        long steps = embedded.shape[1];
        var valid = Alignment.ValidMask(lengths, steps, embedded.device).unsqueeze(-1);
        var x = embedded.masked_fill(valid.logical_not(), 0.0).transpose(1, 2);              // [B, E, T]
        var features = new List<Tensor>(_widths.Length);
        for (int i = 0; i < _widths.Length; i++)
        {
            // Zeros after the last step let the window starting at every step fit, whatever its width.
            var padded = nn.functional.pad(x, new long[] { 0, _widths[i] - 1 });
            features.Add(nn.functional.relu(convolutions[i].call(padded)));                  // [B, F, T]
        }
        return torch.cat(features, 1).transpose(1, 2).contiguous().MoveToOuterDisposeScope();
    }
}
