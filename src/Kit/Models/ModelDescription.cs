using System.Globalization;

namespace Kit.Models;

/// <summary>One plain line describing a classifier config, for report setup tables and run records.</summary>
public static class ModelDescription
{
    public static string Of(ClassifierConfig c)
    {
        var inv = CultureInfo.InvariantCulture;
        string encoder = c.Encoder switch
        {
            EncoderKind.Convolution => $"CNN widths {string.Join("/", c.KernelWidths)} × {c.HiddenSize} filters",
            EncoderKind.Transformer => $"Transformer width {c.HiddenSize}, {c.Heads} heads, {c.Layers} block(s), {c.Positions.ToString().ToLowerInvariant()} positions",
            _ => $"{c.Cell.ToString().ToUpperInvariant()} hidden {c.HiddenSize}, layers {c.Layers}{(c.Bidirectional ? ", bidirectional" : "")}",
        };
        return string.Create(inv, $"{encoder}, embedding {c.EmbeddingSize}, pooling {c.Pooling.ToString().ToLowerInvariant()}, {Dropouts(c)}");
    }

    /// <summary>"no dropout", "dropout 0.2", or the three rates when they differ.</summary>
    public static string Dropouts(ClassifierConfig c)
    {
        var inv = CultureInfo.InvariantCulture;
        if (c.EmbeddingDropout == 0 && c.LayerDropout == 0 && c.HeadDropout == 0) return "no dropout";
        if (c.EmbeddingDropout == c.LayerDropout && c.LayerDropout == c.HeadDropout) return string.Create(inv, $"dropout {c.EmbeddingDropout}");
        return string.Create(inv, $"dropout embeddings {c.EmbeddingDropout}, between layers {c.LayerDropout}, before head {c.HeadDropout}");
    }
}
