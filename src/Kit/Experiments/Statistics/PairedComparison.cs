namespace Kit.Experiments;

/// <summary>
/// Two configs on the same test items for one training seed: every fold's test part joined (each item once),
/// McNemar's test on the discordant items and a paired bootstrap interval of the accuracy difference A − B.
/// </summary>
public sealed record PairedComparison(string A, string B, ulong Seed, int Folds, int Items, McNemarResult McNemar, BootstrapInterval Bootstrap)
{
    /// <summary>
    /// One comparison per training seed. A config with a single seed (the deterministic baseline) is paired with
    /// every seed of the other. Folds missing from either side, or whose test items differ, are
    /// left out and said in <paramref name="notes"/>.
    /// </summary>
    public static IReadOnlyList<PairedComparison> Compare(IReadOnlyList<RunRecord> a, IReadOnlyList<RunRecord> b, List<string>? notes = null,
        int replicates = 2000, ulong bootstrapSeed = 1)
    {
        if (a.Count == 0 || b.Count == 0) return [];
        var seedsA = a.Select(r => r.Seed).Distinct().Order().ToArray();
        var seedsB = b.Select(r => r.Seed).Distinct().Order().ToArray();
        var result = new List<PairedComparison>();
        foreach (var seed in seedsA.Length == 1 ? seedsB : seedsA)
        {
            ulong seedA = seedsA.Length == 1 ? seedsA[0] : seed, partner = seedsB.Length == 1 ? seedsB[0] : seed;
            var correctA = new List<bool>();
            var correctB = new List<bool>();
            int folds = 0;
            foreach (var runA in a.Where(r => r.Seed == seedA).OrderBy(r => r.Fold))
            {
                var runB = b.FirstOrDefault(r => r.Seed == partner && r.Fold == runA.Fold && r.Folds == runA.Folds);
                if (runB is null) { notes?.Add($"{b[0].Config} has no run for seed {partner}, fold {runA.Fold}; left out of the paired test with {runA.Config}"); continue; }
                if (!runA.TestRows.SequenceEqual(runB.TestRows))
                {
                    notes?.Add($"{runA.Id} and {runB.Id} were scored on different test items; left out of the paired test");
                    continue;
                }
                correctA.AddRange(runA.Correct());
                correctB.AddRange(runB.Correct());
                folds++;
            }
            if (folds == 0) continue;
            result.Add(new PairedComparison(a[0].Config, b[0].Config, seed, folds, correctA.Count,
                Experiments.McNemar.Test(correctA, correctB), PairedBootstrap.AccuracyDifference(correctA, correctB, replicates, bootstrapSeed)));
        }
        return result;
    }
}
