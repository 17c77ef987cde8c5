namespace Kit.Diagnostics;

/// <summary>
/// Thin SVD of a tall matrix without forming XᵀX (which would square its condition number): tall-skinny QR
/// (Demmel et al. 2012, "Communication-optimal parallel and sequential QR and LU factorizations") over row
/// blocks that fit in cache, then one-sided Jacobi (Hestenes 1958) on the small d × d factor R. Since X = QR
/// and R = UΣVᵀ, X has the same singular values and right singular vectors as R; Q is never needed for PCA.
/// </summary>
internal static class Svd
{
    const int BlockRows = 4096;

    /// <summary>Singular values (descending) and right singular vectors (rows of the result, same order).</summary>
    public static (double[] Values, double[][] RightVectors) OfRows(int rows, int cols, Action<int, Span<double>> fillColumnMajorBlock)
    {
        int blocks = (rows + BlockRows - 1) / BlockRows;
        var factors = new double[blocks][];
        Parallel.For(0, blocks, b =>
        {
            int start = b * BlockRows, m = Math.Min(BlockRows, rows - start);
            var a = new double[m * cols];
            fillColumnMajorBlock(start, a);
            factors[b] = UpperFactor(a, m, cols);
        });
        // Stacked R factors are themselves a tall matrix; one more QR reduces them to one d × d factor.
        double[] r;
        if (blocks == 1) r = factors[0];
        else
        {
            int m = blocks * cols;
            var stacked = new double[m * cols];
            for (int b = 0; b < blocks; b++)
                for (int c = 0; c < cols; c++)
                    Array.Copy(factors[b], c * cols, stacked, c * m + b * cols, cols);
            r = UpperFactor(stacked, m, cols);
        }
        return Jacobi(r, cols);
    }

    /// <summary>Householder QR of a column-major m × d block; returns R as a column-major d × d array (rows past m zero).</summary>
    internal static double[] UpperFactor(double[] a, int m, int d)
    {
        int steps = Math.Min(m, d);
        for (int j = 0; j < steps; j++)
        {
            var v = a.AsSpan(j * m + j, m - j);
            double norm = Math.Sqrt(DenseKernels.Dot(v, v));
            if (norm == 0) continue;
            double alpha = v[0] >= 0 ? -norm : norm;
            v[0] -= alpha;           // v = x − alpha·e1, stored in place of the column
            double vv = DenseKernels.Dot(v, v);
            for (int c = j + 1; c < d; c++)
            {
                var col = a.AsSpan(c * m + j, m - j);
                DenseKernels.AddScaled(col, -2 * DenseKernels.Dot(v, col) / vv, v);
            }
            v[0] = alpha;            // the column's R entry; the rest of v is discarded below
        }
        var r = new double[d * d];
        for (int c = 0; c < d; c++)
            for (int i = 0; i <= Math.Min(c, steps - 1); i++)
                r[c * d + i] = a[c * m + i];
        return r;
    }

    /// <summary>One-sided Jacobi SVD of a column-major d × d matrix.</summary>
    internal static (double[] Values, double[][] RightVectors) Jacobi(double[] w, int d)
    {
        var v = new double[d * d];
        for (int i = 0; i < d; i++) v[i * d + i] = 1;
        for (int sweep = 0; sweep < 60; sweep++)
        {
            bool rotated = false;
            for (int p = 0; p < d - 1; p++)
                for (int q = p + 1; q < d; q++)
                {
                    var wp = w.AsSpan(p * d, d);
                    var wq = w.AsSpan(q * d, d);
                    double alpha = DenseKernels.Dot(wp, wp), beta = DenseKernels.Dot(wq, wq), gamma = DenseKernels.Dot(wp, wq);
                    if (Math.Abs(gamma) <= 1e-15 * Math.Sqrt(alpha * beta) || gamma == 0) continue;
                    rotated = true;
                    double zeta = (beta - alpha) / (2 * gamma);
                    double t = Math.Sign(zeta == 0 ? 1 : zeta) / (Math.Abs(zeta) + Math.Sqrt(1 + zeta * zeta));
                    double c = 1 / Math.Sqrt(1 + t * t), s = c * t;
                    Rotate(wp, wq, c, s);
                    Rotate(v.AsSpan(p * d, d), v.AsSpan(q * d, d), c, s);
                }
            if (!rotated) break;
        }
        var sigma = new double[d];
        for (int j = 0; j < d; j++) { var col = w.AsSpan(j * d, d); sigma[j] = Math.Sqrt(DenseKernels.Dot(col, col)); }
        var order = Enumerable.Range(0, d).OrderByDescending(j => sigma[j]).ThenBy(j => j).ToArray();
        var vectors = new double[d][];
        for (int i = 0; i < d; i++)
        {
            var vec = v.AsSpan(order[i] * d, d).ToArray();
            // Singular vectors are defined up to sign; fixing the largest entry positive makes output repeatable.
            int big = 0;
            for (int j = 1; j < d; j++) if (Math.Abs(vec[j]) > Math.Abs(vec[big])) big = j;
            if (vec[big] < 0) for (int j = 0; j < d; j++) vec[j] = -vec[j];
            vectors[i] = vec;
        }
        return (order.Select(j => sigma[j]).ToArray(), vectors);
    }

    static void Rotate(Span<double> x, Span<double> y, double c, double s)
    {
        for (int i = 0; i < x.Length; i++)
        {
            double a = x[i], b = y[i];
            x[i] = c * a - s * b;
            y[i] = s * a + c * b;
        }
    }
}
