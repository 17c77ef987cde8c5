namespace Kit.Data;

/// <summary>
/// How many rows of each class go to each part. Each cell is the floor or the ceiling of its exact share
/// (class count × fraction), each class's cells add up to the class count, and among the cells that may round
/// up, those of parts lagging furthest behind their running exact total go first, so part sizes also stay
/// within a row or so of their targets however many classes there are.
/// </summary>
internal static class QuotaAllocator
{
    public static int[,] Allocate(int[] classCounts, double[] fractions)
    {
        int parts = fractions.Length;
        var result = new int[classCounts.Length, parts];
        var runningExact = new double[parts];
        var runningGiven = new long[parts];
        var exact = new double[parts];
        var order = new int[parts];
        for (int c = 0; c < classCounts.Length; c++)
        {
            int n = classCounts[c], given = 0;
            for (int p = 0; p < parts; p++)
            {
                // Rounded to 1e-9 so that 0.1 * 30 = 3.0000000000000004 counts as exactly 3.
                exact[p] = Math.Round(n * fractions[p], 9);
                result[c, p] = (int)Math.Floor(exact[p]);
                given += result[c, p];
                runningExact[p] += exact[p];
            }
            int roundUps = n - given;
            for (int p = 0; p < parts; p++) order[p] = p;
            Array.Sort(order, (a, b) =>
            {
                bool canA = exact[a] > result[c, a], canB = exact[b] > result[c, b];
                if (canA != canB) return canA ? -1 : 1;
                double lagA = runningExact[a] - runningGiven[a] - result[c, a];
                double lagB = runningExact[b] - runningGiven[b] - result[c, b];
                int byLag = lagB.CompareTo(lagA);
                if (byLag != 0) return byLag;
                return a.CompareTo(b);
            });
            for (int k = 0; k < roundUps; k++) result[c, order[k]]++;
            for (int p = 0; p < parts; p++) runningGiven[p] += result[c, p];
        }
        return result;
    }
}
