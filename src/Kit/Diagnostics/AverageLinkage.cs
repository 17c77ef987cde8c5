namespace Kit.Diagnostics;

/// <summary>One merge of two clusters: ids below the leaf count are leaves, id n + i is the cluster made by merge i.</summary>
internal sealed record LinkageMerge(int First, int Second, double Height, int Size);

/// <summary>The merges in the order they happened (heights never fall) and the leaves read left to right.</summary>
internal sealed record LinkageTree(IReadOnlyList<LinkageMerge> Merges, int[] LeafOrder);

/// <summary>
/// Agglomerative clustering with average linkage (UPGMA; Sokal and Michener 1958): start with every item alone,
/// repeatedly join the two clusters whose mean pairwise distance is smallest, and update the distances with the
/// Lance–Williams rule d(a∪b, c) = (|a| d(a, c) + |b| d(b, c)) / (|a| + |b|). Ties go to the pair found first
/// (lower slot, then lower partner), so the tree repeats exactly. Each merge lists the smaller id first and the
/// leaf order walks the tree first-then-second, the numbering SciPy's <c>linkage</c>/<c>leaves_list</c> use,
/// which the tests compare against. Cubic in the item count: meant for class counts (tens to a few hundred).
/// </summary>
internal static class AverageLinkage
{
    public static LinkageTree Compute(double[,] distances)
    {
        ArgumentNullException.ThrowIfNull(distances);
        int n = distances.GetLength(0);
        if (distances.GetLength(1) != n) throw new ArgumentException($"the distance matrix is {n} × {distances.GetLength(1)}; it must be square.", nameof(distances));
        if (n == 0) throw new ArgumentException("the distance matrix is empty.", nameof(distances));
        var d = new double[n, n];
        for (int i = 0; i < n; i++)
            for (int j = 0; j < n; j++)
            {
                double v = distances[i, j];
                if (i == j) continue;
                if (!double.IsFinite(v) || v < 0)
                    throw new ArgumentException($"distance [{i}, {j}] = {v}; distances must be finite and not negative.", nameof(distances));
                if (Math.Abs(v - distances[j, i]) > 1e-12 * Math.Max(1, Math.Abs(v)))
                    throw new ArgumentException($"distance [{i}, {j}] = {v} but [{j}, {i}] = {distances[j, i]}; the matrix must be symmetric.", nameof(distances));
                d[i, j] = v;
            }

        // Slot s holds cluster id[s] of size[s]; a merge keeps the lower slot and retires the higher.
        var id = Enumerable.Range(0, n).ToArray();
        var size = Enumerable.Repeat(1, n).ToArray();
        var alive = Enumerable.Repeat(true, n).ToArray();
        var merges = new List<LinkageMerge>(n - 1);
        for (int step = 0; step < n - 1; step++)
        {
            int a = -1, b = -1;
            double best = double.PositiveInfinity;
            for (int i = 0; i < n; i++)
            {
                if (!alive[i]) continue;
                for (int j = i + 1; j < n; j++)
                    if (alive[j] && d[i, j] < best) { best = d[i, j]; a = i; b = j; }
            }
            int na = size[a], nb = size[b];
            for (int c = 0; c < n; c++)
            {
                if (!alive[c] || c == a || c == b) continue;
                double v = (na * d[a, c] + nb * d[b, c]) / (na + nb);
                d[a, c] = d[c, a] = v;
            }
            merges.Add(new LinkageMerge(Math.Min(id[a], id[b]), Math.Max(id[a], id[b]), best, na + nb));
            alive[b] = false;
            id[a] = n + step;
            size[a] = na + nb;
        }
        return new LinkageTree(merges, LeafOrder(merges, n));
    }

    static int[] LeafOrder(IReadOnlyList<LinkageMerge> merges, int n)
    {
        if (n == 1) return [0];
        var order = new List<int>(n);
        var pending = new Stack<int>();
        pending.Push(n + merges.Count - 1);
        while (pending.Count > 0)
        {
            int node = pending.Pop();
            if (node < n) { order.Add(node); continue; }
            var m = merges[node - n];
            pending.Push(m.Second);   // popped after the whole first subtree
            pending.Push(m.First);
        }
        return order.ToArray();
    }
}
