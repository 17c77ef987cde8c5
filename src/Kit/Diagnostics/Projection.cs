using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// A 2-D picture of vectors: token embeddings (one point per vocabulary entry) or pooled sequence
/// representations (one point per example, with its true label and whether the model got it right).
/// For PCA, VarianceShare holds the two axes' shares; for t-SNE it is empty, since its axes have no
/// meaning of their own.
/// </summary>
public sealed record Projection(ProjectionMethod Method, IReadOnlyList<ProjectionPoint> Points, IReadOnlyList<double> VarianceShare)
{
    /// <summary>Projects an embedding matrix whose row t belongs to token <paramref name="tokens"/>[t].</summary>
    public static Projection OfTokens(double[][] embedding, IReadOnlyList<string> tokens, ProjectionMethod method, TsneOptions? tsne = null,
        IProgress<TsneProgress>? progress = null)
    {
        ArgumentNullException.ThrowIfNull(tokens);
        InputChecks.FiniteMatrix(embedding, nameof(embedding));
        InputChecks.SameLength(embedding.Length, nameof(embedding), tokens.Count, nameof(tokens));
        var (coords, ratios) = Project(embedding, method, tsne, progress);
        return new Projection(method, coords.Select((c, i) => new ProjectionPoint(c[0], c[1], null, tokens[i], null)).ToArray(), ratios);
    }

    /// <summary>
    /// Projects pooled sequence vectors; <paramref name="predicted"/> (optional) marks each point correct or
    /// wrong, <paramref name="texts"/> (optional) carries the sequence for hover text.
    /// </summary>
    public static Projection OfSequences(double[][] pooled, int[] labels, IReadOnlyList<string> classNames, ProjectionMethod method,
        int[]? predicted = null, IReadOnlyList<string>? texts = null, TsneOptions? tsne = null, IProgress<TsneProgress>? progress = null)
    {
        InputChecks.FiniteMatrix(pooled, nameof(pooled));
        InputChecks.ClassNames(classNames);
        ArgumentNullException.ThrowIfNull(labels);
        InputChecks.SameLength(pooled.Length, nameof(pooled), labels.Length, nameof(labels));
        InputChecks.Labels(labels, classNames.Count);
        if (predicted is not null)
        {
            InputChecks.SameLength(pooled.Length, nameof(pooled), predicted.Length, nameof(predicted));
            InputChecks.Labels(predicted, classNames.Count, nameof(predicted));
        }
        if (texts is not null) InputChecks.SameLength(pooled.Length, nameof(pooled), texts.Count, nameof(texts));
        var (coords, ratios) = Project(pooled, method, tsne, progress);
        var points = coords.Select((c, i) => new ProjectionPoint(c[0], c[1], classNames[labels[i]], texts?[i],
            predicted is null ? null : predicted[i] == labels[i])).ToArray();
        return new Projection(method, points, ratios);
    }

    static (double[][] Coords, double[] Ratios) Project(double[][] x, ProjectionMethod method, TsneOptions? tsne, IProgress<TsneProgress>? progress)
    {
        switch (method)
        {
            case ProjectionMethod.Pca:
                if (x[0].Length < 2) throw new ArgumentException($"vectors have {x[0].Length} dimension; a 2-D PCA needs at least two.");
                var pca = Pca.Of(x, 2);
                return (pca.Project(x), pca.VarianceShare);
            case ProjectionMethod.Tsne:
                // Without explicit options a small vocabulary (a few dozen characters) would fail the default
                // perplexity of 30, so the default shrinks to what the point count allows; explicit options are
                // taken as given and rejected if impossible.
                var options = tsne ?? new TsneOptions { Perplexity = Math.Min(30, Math.Max(1, (x.Length - 1) / 3)) };
                return (Tsne.Run(x, options, progress), []);
            default:
                throw new ArgumentOutOfRangeException(nameof(method), $"unknown projection method {method}.");
        }
    }

    /// <summary>X, Y, Label, Text, Correct (null where not known).</summary>
    public DataFrame ToDataFrame() => new(
        FrameColumns.Number("X", Points.Select(p => p.X)),
        FrameColumns.Number("Y", Points.Select(p => p.Y)),
        FrameColumns.Text("Label", Points.Select(p => p.Label)),
        FrameColumns.Text("Text", Points.Select(p => p.Text)),
        FrameColumns.Flag("Correct", Points.Select(p => p.Correct)));
}
