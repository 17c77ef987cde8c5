using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Principal component analysis of the column-centred data by singular value decomposition. Explained variance
/// of component j is σ_j² / (n − 1), the sample covariance's eigenvalue; the ratio divides by the total variance
/// over all components, not only the kept ones.
/// </summary>
public sealed record Pca
{
    public required double[] Mean { get; init; }
    /// <summary>Unit principal axes, one row per component, strongest first (sign: largest entry positive).</summary>
    public required double[][] Components { get; init; }
    public required double[] SingularValues { get; init; }
    public required double[] ExplainedVariance { get; init; }
    public required double[] ExplainedVarianceRatio { get; init; }
    public required double TotalVariance { get; init; }
    public required int Count { get; init; }

    public static Pca Fit(double[][] x, int components)
    {
        InputChecks.FiniteMatrix(x, nameof(x));
        int n = x.Length, d = x[0].Length;
        if (n < 2) throw new ArgumentException($"x has {n} row; PCA needs at least two.", nameof(x));
        if (components < 1 || components > d)
            throw new ArgumentOutOfRangeException(nameof(components), $"components = {components}; x has {d} columns, so 1..{d} are possible.");
        var mean = new double[d];
        foreach (var row in x) for (int j = 0; j < d; j++) mean[j] += row[j];
        for (int j = 0; j < d; j++) mean[j] /= n;

        var (sigma, vectors) = Svd.OfRows(n, d, (start, block) =>
        {
            int m = block.Length / d;
            for (int c = 0; c < d; c++)
                for (int i = 0; i < m; i++)
                    block[c * m + i] = x[start + i][c] - mean[c];
        });
        var variance = sigma.Select(s => s * s / (n - 1)).ToArray();
        double total = variance.Sum();
        return new Pca
        {
            Mean = mean,
            Components = vectors.Take(components).ToArray(),
            SingularValues = sigma.Take(components).ToArray(),
            ExplainedVariance = variance.Take(components).ToArray(),
            ExplainedVarianceRatio = variance.Take(components).Select(v => total == 0 ? 0 : v / total).ToArray(),
            TotalVariance = total,
            Count = n,
        };
    }

    public static Pca Fit(float[][] x, int components)
    {
        ArgumentNullException.ThrowIfNull(x);
        return Fit(x.Select(r => r is null ? null! : Array.ConvertAll(r, v => (double)v)).ToArray(), components);
    }

    /// <summary>Coordinates of each row on the kept components.</summary>
    public double[][] Transform(double[][] x)
    {
        InputChecks.FiniteMatrix(x, nameof(x), Mean.Length);
        var result = new double[x.Length][];
        Parallel.For(0, x.Length, i =>
        {
            var centred = new double[Mean.Length];
            for (int j = 0; j < centred.Length; j++) centred[j] = x[i][j] - Mean[j];
            var y = new double[Components.Length];
            for (int c = 0; c < y.Length; c++) y[c] = DenseKernels.Dot(centred, Components[c]);
            result[i] = y;
        });
        return result;
    }

    /// <summary>Component, ExplainedVariance, ExplainedVarianceRatio, CumulativeRatio.</summary>
    public DataFrame ToDataFrame()
    {
        var cumulative = new double[ExplainedVarianceRatio.Length];
        double run = 0;
        for (int i = 0; i < cumulative.Length; i++) cumulative[i] = run += ExplainedVarianceRatio[i];
        return new DataFrame(
            FrameColumns.Count("Component", Enumerable.Range(1, Components.Length)),
            FrameColumns.Number("ExplainedVariance", ExplainedVariance),
            FrameColumns.Number("ExplainedVarianceRatio", ExplainedVarianceRatio),
            FrameColumns.Number("CumulativeRatio", cumulative));
    }
}
