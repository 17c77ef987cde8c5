using Kit.Common;
namespace Kit.Data;

/// <summary>
/// Puts whole groups into parts. Groups are taken largest first (seeded shuffle breaks ties in size) and each
/// goes to the part where it most reduces the squared distance between the parts and their targets: per class
/// as a share of that class, plus overall size as a share of all rows. This is as stratified as the groups allow
/// for a greedy rule; a group never straddles two parts by construction.
/// </summary>
internal static class GroupAssigner
{
    /// <returns>The part of every row.</returns>
    public static int[] Assign(int[] labels, string[] groups, double[] fractions, ulong seed)
    {
        if (groups.Length != labels.Length) throw new ArgumentException($"{groups.Length} groups for {labels.Length} labels");
        int n = labels.Length, classes = labels.Length == 0 ? 0 : labels.Max() + 1, parts = fractions.Length;
        var groupIndex = new Dictionary<string, int>(StringComparer.Ordinal);
        var members = new List<List<int>>();
        for (int i = 0; i < n; i++)
        {
            if (!groupIndex.TryGetValue(groups[i], out int g))
            {
                groupIndex[groups[i]] = g = members.Count;
                members.Add(new List<int>());
            }
            members[g].Add(i);
        }
        int positiveParts = fractions.Count(f => f > 0);
        if (members.Count < positiveParts)
            throw new ArgumentException($"{members.Count} group(s) cannot fill {positiveParts} part(s): every part needs at least one whole group");

        var order = Enumerable.Range(0, members.Count).ToArray();
        new SplitMix64(seed).Shuffle(order.AsSpan());
        // Stable sort keeps the shuffled order among groups of equal size.
        order = order.OrderByDescending(g => members[g].Count).ToArray();

        var classTotals = new int[classes];
        foreach (int l in labels) classTotals[l]++;
        var counts = new double[parts, classes];
        var sizes = new double[parts];
        var groupsIn = new int[parts];
        var groupOf = new int[members.Count];
        var groupClass = new Dictionary<int, int>();
        foreach (int g in order)
        {
            groupClass.Clear();
            foreach (int r in members[g]) groupClass[labels[r]] = groupClass.GetValueOrDefault(labels[r]) + 1;
            int s = members[g].Count, best = -1;
            double bestCost = double.PositiveInfinity;
            for (int p = 0; p < parts; p++)
            {
                if (fractions[p] <= 0) continue;
                double cost = 0;
                foreach (var (c, v) in groupClass)
                {
                    double dev = counts[p, c] - classTotals[c] * fractions[p];
                    cost += v * (2 * dev + v) / ((double)classTotals[c] * classTotals[c]);
                }
                double sizeDev = sizes[p] - n * fractions[p];
                cost += s * (2 * sizeDev + s) / ((double)n * n);
                // Ties (common for the first groups) go to the emptiest part relative to its target.
                if (cost < bestCost - 1e-15 || (Math.Abs(cost - bestCost) <= 1e-15 && sizes[p] / fractions[p] < sizes[best] / fractions[best]))
                {
                    bestCost = cost;
                    best = p;
                }
            }
            groupOf[g] = best;
            groupsIn[best]++;
            sizes[best] += s;
            foreach (var (c, v) in groupClass) counts[best, c] += v;
        }

        // A part with a positive fraction must not end up empty: move the smallest group of the part holding most groups.
        for (int p = 0; p < parts; p++)
        {
            if (fractions[p] <= 0 || groupsIn[p] > 0) continue;
            int donor = Enumerable.Range(0, parts).MaxBy(q => groupsIn[q]);
            int smallest = order.Where(g => groupOf[g] == donor).MinBy(g => members[g].Count);
            groupOf[smallest] = p;
            groupsIn[donor]--;
            groupsIn[p]++;
        }

        var partOf = new int[n];
        for (int g = 0; g < members.Count; g++)
            foreach (int r in members[g]) partOf[r] = groupOf[g];
        return partOf;
    }
}
