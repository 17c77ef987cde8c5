namespace Kit.Diagnostics;

/// <summary>
/// A class order for confusion matrices that puts classes mixed up with each other side by side: the leaf order
/// of an average-linkage clustering (<see cref="AverageLinkage"/>) on the distance 1 − s, where s is the
/// symmetrised confusion rate (share of class a's rows called b plus share of b's called a, halved). Classes
/// never confused with anything are all at distance 1 from the rest and keep their relative input order.
/// </summary>
internal static class ConfusionOrder
{
    public static int[] Of(ClassificationMetrics m)
    {
        ArgumentNullException.ThrowIfNull(m);
        return Of(m.ConfusionNormalised);
    }

    /// <param name="rowShares">Row-normalised confusion: [true, predicted] = share of the true class's rows (NaN for an empty row counts as 0).</param>
    public static int[] Of(double[,] rowShares) => AverageLinkage.Compute(Distances(rowShares)).LeafOrder;

    public static double[,] Distances(double[,] rowShares)
    {
        ArgumentNullException.ThrowIfNull(rowShares);
        int k = rowShares.GetLength(0);
        if (rowShares.GetLength(1) != k) throw new ArgumentException($"the confusion matrix is {k} × {rowShares.GetLength(1)}; it must be square.", nameof(rowShares));
        var d = new double[k, k];
        for (int i = 0; i < k; i++)
            for (int j = i + 1; j < k; j++)
            {
                double s = (Share(rowShares[i, j]) + Share(rowShares[j, i])) / 2;
                d[i, j] = d[j, i] = 1 - s;
            }
        return d;
    }

    static double Share(double v) => double.IsFinite(v) ? Math.Clamp(v, 0, 1) : 0;
}
