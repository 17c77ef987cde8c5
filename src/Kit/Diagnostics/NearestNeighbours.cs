namespace Kit.Diagnostics;

/// <summary>
/// Exact k nearest neighbours by brute force with a bounded max-heap per point. At the sizes t-SNE is used for
/// here (≤ ~20k points, ≤ a few hundred dimensions) this is a few seconds on two cores and has no
/// approximation to explain; a vantage-point tree gains little in 64 dimensions, where its pruning weakens.
/// </summary>
internal static class NearestNeighbours
{
    /// <summary>Indices and squared distances of each point's k nearest others, nearest first (ties by index).</summary>
    public static (int[][] Index, double[][] SquaredDistance) Find(double[][] x, int k, ParallelOptions parallel)
    {
        int n = x.Length;
        var index = new int[n][];
        var dist = new double[n][];
        Parallel.For(0, n, parallel, i =>
        {
            var heapIdx = new int[k];
            var heapDist = new double[k];
            int size = 0;
            var xi = x[i];
            for (int j = 0; j < n; j++)
            {
                if (j == i) continue;
                double d = DenseKernels.SquaredDistance(xi, x[j]);
                if (size < k) { Push(heapIdx, heapDist, ref size, j, d); continue; }
                if (d < heapDist[0]) ReplaceTop(heapIdx, heapDist, size, j, d);
            }
            var order = Enumerable.Range(0, size).OrderBy(t => heapDist[t]).ThenBy(t => heapIdx[t]).ToArray();
            index[i] = order.Select(t => heapIdx[t]).ToArray();
            dist[i] = order.Select(t => heapDist[t]).ToArray();
        });
        return (index, dist);
    }

    // Max-heap on distance; j increases monotonically, so equal distances keep the earlier index (strict <).
    static void Push(int[] idx, double[] d, ref int size, int j, double v)
    {
        int c = size++;
        while (c > 0)
        {
            int parent = (c - 1) / 2;
            if (d[parent] >= v) break;
            idx[c] = idx[parent]; d[c] = d[parent];
            c = parent;
        }
        idx[c] = j; d[c] = v;
    }

    static void ReplaceTop(int[] idx, double[] d, int size, int j, double v)
    {
        int c = 0;
        while (true)
        {
            int l = 2 * c + 1, r = l + 1, big = c;
            double bigV = v;
            if (l < size && d[l] > bigV) { big = l; bigV = d[l]; }
            if (r < size && d[r] > bigV) { big = r; }
            if (big == c) break;
            idx[c] = idx[big]; d[c] = d[big];
            c = big;
        }
        idx[c] = j; d[c] = v;
    }
}
