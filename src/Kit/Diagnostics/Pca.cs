using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Principal component analysis of the column-centred data by singular value decomposition. The variance along
/// axis j is σ_j² / (n − 1), the sample covariance's eigenvalue; its share divides by the total variance over
/// all axes, not only the kept ones.
/// </summary>
public sealed record Pca
{
    /// <summary>Column means; <see cref="Project"/> subtracts them first.</summary>
    public required double[] Centre { get; init; }
    /// <summary>Unit principal axes, one row per kept axis, strongest first (sign: largest entry positive).</summary>
    public required double[][] Axes { get; init; }
    /// <summary>Sample variance of the data along each kept axis.</summary>
    public required double[] AxisVariance { get; init; }
    /// <summary>Each kept axis's variance as a share of <see cref="TotalVariance"/>.</summary>
    public required double[] VarianceShare { get; init; }
    public required double TotalVariance { get; init; }
    public required int Rows { get; init; }

    /// <summary>The <paramref name="axes"/> strongest principal axes of the rows of <paramref name="x"/>.</summary>
    public static Pca Of(double[][] x, int axes)
    {
        InputChecks.FiniteMatrix(x, nameof(x));
        int n = x.Length, d = x[0].Length;
        if (n < 2) throw new ArgumentException($"x has {n} row; PCA needs at least two.", nameof(x));
        if (axes < 1 || axes > d)
            throw new ArgumentOutOfRangeException(nameof(axes), $"axes = {axes}; x has {d} columns, so 1..{d} are possible.");
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
            Centre = mean,
            Axes = vectors.Take(axes).ToArray(),
            AxisVariance = variance.Take(axes).ToArray(),
            VarianceShare = variance.Take(axes).Select(v => total == 0 ? 0 : v / total).ToArray(),
            TotalVariance = total,
            Rows = n,
        };
    }

    public static Pca Of(float[][] x, int axes)
    {
        ArgumentNullException.ThrowIfNull(x);
        return Of(x.Select(r => r is null ? null! : Array.ConvertAll(r, v => (double)v)).ToArray(), axes);
    }

    /// <summary>Coordinates of each row on the kept axes.</summary>
    public double[][] Project(double[][] x)
    {
        InputChecks.FiniteMatrix(x, nameof(x), Centre.Length);
        var result = new double[x.Length][];
        Parallel.For(0, x.Length, i =>
        {
            var centred = new double[Centre.Length];
            for (int j = 0; j < centred.Length; j++) centred[j] = x[i][j] - Centre[j];
            var y = new double[Axes.Length];
            for (int c = 0; c < y.Length; c++) y[c] = DenseKernels.Dot(centred, Axes[c]);
            result[i] = y;
        });
        return result;
    }

    /// <summary>Axis, Variance, VarianceShare, CumulativeShare.</summary>
    public DataFrame ToDataFrame()
    {
        var cumulative = new double[VarianceShare.Length];
        double run = 0;
        for (int i = 0; i < cumulative.Length; i++) cumulative[i] = run += VarianceShare[i];
        return new DataFrame(
            FrameColumns.Count("Axis", Enumerable.Range(1, Axes.Length)),
            FrameColumns.Number("Variance", AxisVariance),
            FrameColumns.Number("VarianceShare", VarianceShare),
            FrameColumns.Number("CumulativeShare", cumulative));
    }
}
