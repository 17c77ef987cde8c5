using Kit.Common;
using CsCheck;
using Kit.Data;

namespace Kit.Tests.Data;

/// <summary>
/// Splitter properties over random inputs (CsCheck 5.0.1). The k-fold bound "each fold's count of every class
/// differs from the exact proportion by less than one row" is the usual meaning of stratified (common practice,
/// no source).
/// </summary>
public class SplitterTests
{
    static readonly Gen<int[]> Labels = Gen.Int[1, 6].SelectMany(classes => Gen.Int[0, classes - 1].Array[12, 300]);

    static int[] Count(int[] labels, int[] rows, int classes)
    {
        var counts = new int[classes];
        foreach (int r in rows) counts[labels[r]]++;
        return counts;
    }

    static void AssertPartition(int n, params int[][] parts)
    {
        var all = parts.SelectMany(p => p).OrderBy(x => x).ToArray();
        Assert.Equal(Enumerable.Range(0, n), all);
        foreach (var p in parts) Assert.Equal(p.OrderBy(x => x), p);
    }

    [Fact]
    public void FoldsByClassIsWithinOneRowOfExactForEveryClass()
    {
        Gen.Select(Labels, Gen.Int[2, 10], Gen.ULong).Sample((labels, k, seed) =>
        {
            if (k > labels.Length) return;
            int classes = labels.Max() + 1;
            var folds = Splitter.FoldsByClass(labels, k, seed);
            Assert.Equal(k, folds.Count);
            AssertPartition(labels.Length, folds.Select(f => f.Test).ToArray());
            var total = Count(labels, Enumerable.Range(0, labels.Length).ToArray(), classes);
            foreach (var fold in folds)
            {
                AssertPartition(labels.Length, fold.Train, fold.Validation, fold.Test);
                var counts = Count(labels, fold.Test, classes);
                for (int c = 0; c < classes; c++)
                    Assert.True(Math.Abs(counts[c] - (double)total[c] / k) < 1, $"class {c}: {counts[c]} vs {total[c]}/{k}");
                Assert.True(Math.Abs(fold.Test.Length - (double)labels.Length / k) <= 1.5, $"fold size {fold.Test.Length} vs {labels.Length}/{k}");
            }
        }, iter: 300, threads: 1);
    }

    [Fact]
    public void StratifiedHoldoutIsWithinOneRowOfExactForEveryClassAndPart()
    {
        Gen.Select(Labels, Gen.Int[1, 8], Gen.ULong).Sample((labels, tenths, seed) =>
        {
            double train = tenths / 10.0, validation = (10 - tenths) / 20.0, test = 1 - train - validation;
            var split = Splitter.StratifiedHoldout(labels, train, validation, test, seed);
            AssertPartition(labels.Length, split.Train, split.Validation, split.Test);
            int classes = labels.Max() + 1;
            var total = Count(labels, Enumerable.Range(0, labels.Length).ToArray(), classes);
            double[] fractions = [train, validation, test];
            for (int p = 0; p < 3; p++)
            {
                var counts = Count(labels, split.Rows(p), classes);
                for (int c = 0; c < classes; c++) Assert.True(Math.Abs(counts[c] - total[c] * fractions[p]) < 1);
                Assert.Equal(counts, split.Summary.Parts[p].ClassCounts);
            }
        }, iter: 300, threads: 1);
    }

    [Fact]
    public void KFoldValidationIsCarvedFromTrainingFoldsOnly()
    {
        var labels = Enumerable.Range(0, 200).Select(i => i % 3).ToArray();
        foreach (var fold in Splitter.FoldsByClass(labels, 5, 7, validation: 0.25))
        {
            AssertPartition(200, fold.Train, fold.Validation, fold.Test);
            Assert.Equal(40, fold.Test.Length);
            Assert.Equal(40, fold.Validation.Length); // 25 % of the 160 training rows.
        }
    }

    [Fact]
    public void GroupSplitsNeverPutOneGroupInTwoParts()
    {
        var gen = Gen.Select(Labels, Gen.Int[3, 40], Gen.ULong, Gen.Int[2, 6]);
        gen.Sample((labels, groupCount, seed, k) =>
        {
            var groups = labels.Select((_, i) => $"g{(i * 7919 + (int)(seed % 97)) % groupCount}").ToArray();
            int distinct = groups.Distinct().Count();
            if (distinct < 3) return;
            var split = Splitter.GroupHoldout(labels, groups, 0.6, 0.2, 0.2, seed);
            AssertPartition(labels.Length, split.Train, split.Validation, split.Test);
            var partOf = split.PartOf(labels.Length);
            foreach (var g in groups.Select((g, i) => (g, i)).GroupBy(x => x.g))
                Assert.Single(g.Select(x => partOf[x.i]).Distinct());
            Assert.All(split.Summary.Parts, p => Assert.True(p.Rows > 0, $"{p.Part} is empty"));
            if (distinct < k) return;
            var folds = Splitter.FoldsByGroup(labels, groups, k, seed);
            AssertPartition(labels.Length, folds.Select(f => f.Test).ToArray());
            foreach (var fold in folds)
            {
                var testGroups = fold.Test.Select(r => groups[r]).ToHashSet();
                Assert.DoesNotContain(fold.Train, r => testGroups.Contains(groups[r]));
            }
        }, iter: 300, threads: 1);
    }

    [Fact]
    public void GroupHoldoutWithSingletonGroupsIsNearlyStratified()
    {
        // With one row per group nothing stops full stratification; the greedy rule should get within two rows.
        Gen.Select(Labels, Gen.ULong).Sample((labels, seed) =>
        {
            var groups = labels.Select((_, i) => i.ToString(System.Globalization.CultureInfo.InvariantCulture)).ToArray();
            var split = Splitter.GroupHoldout(labels, groups, 0.8, 0.1, 0.1, seed);
            int classes = labels.Max() + 1;
            var total = Count(labels, Enumerable.Range(0, labels.Length).ToArray(), classes);
            double[] fractions = [0.8, 0.1, 0.1];
            for (int p = 0; p < 3; p++)
            {
                var counts = Count(labels, split.Rows(p), classes);
                for (int c = 0; c < classes; c++) Assert.True(Math.Abs(counts[c] - total[c] * fractions[p]) <= 2, $"part {p} class {c}: {counts[c]} vs {total[c] * fractions[p]}");
            }
        }, iter: 200, threads: 1);
    }

    [Fact]
    public void LengthStratifiedBalancesEveryLengthBinAndClass()
    {
        Gen.Select(Labels, Gen.ULong).Sample((labels, seed) =>
        {
            var lengths = labels.Select((l, i) => 1 + (i * 31 + l * 7) % 50).ToArray();
            var split = Splitter.LengthStratified(labels, lengths, 0.7, 0.15, 0.15, seed, bins: 3);
            AssertPartition(labels.Length, split.Train, split.Validation, split.Test);
            var bins = Splitter.LengthBins(lengths, 3);
            var partOf = split.PartOf(labels.Length);
            double[] fractions = [0.7, 0.15, 0.15];
            foreach (var stratum in Enumerable.Range(0, labels.Length).GroupBy(i => (bins[i], labels[i])))
                for (int p = 0; p < 3; p++)
                    Assert.True(Math.Abs(stratum.Count(i => partOf[i] == p) - stratum.Count() * fractions[p]) < 1);
            Assert.Equal(split.Train.Length, split.Summary.Parts[0].Lengths.Count);
        }, iter: 200, threads: 1);
    }

    [Fact]
    public void SameSeedSameSplitOtherSeedOtherSplit()
    {
        var labels = Enumerable.Range(0, 500).Select(i => i % 4).ToArray();
        var a = Splitter.StratifiedHoldout(labels, 0.8, 0.1, 0.1, 42);
        var b = Splitter.StratifiedHoldout(labels, 0.8, 0.1, 0.1, 42);
        var c = Splitter.StratifiedHoldout(labels, 0.8, 0.1, 0.1, 43);
        Assert.Equal(a.Test, b.Test);
        Assert.NotEqual(a.Test, c.Test);
    }

    [Fact]
    public void SummaryReportsCountsProportionsAndLengths()
    {
        int[] labels = [0, 0, 0, 0, 1, 1, 1, 1, 1, 1];
        int[] lengths = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
        var split = Splitter.StratifiedHoldout(labels, 0.5, 0, 0.5, 3, lengths);
        var train = split.Summary.Parts[0];
        Assert.Equal(5, train.Rows);
        Assert.Equal([2, 3], train.ClassCounts);
        Assert.Equal([0.4, 0.6], train.Proportions);
        Assert.Equal(split.Train.Select(r => lengths[r]).Max(), train.Lengths.Max);
        Assert.Equal(0, split.Summary.Parts[1].Rows);
        var df = split.Summary.ToDataFrame(["short", "long"]);
        Assert.Equal(6, df.Rows.Count);
        Assert.Equal("long", df.Columns["class"][1]);
    }

    [Fact]
    public void FromColumnUsesTheGivenAssignment()
    {
        var split = Splitter.FromColumn(["train", "test", "dev", "Train"], [0, 1, 0, 1]);
        Assert.Equal([0, 3], split.Train);
        Assert.Equal([2], split.Validation);
        Assert.Equal([1], split.Test);
        var df = split.ToDataFrame();
        Assert.Equal(["train", "test", "validation", "train"], df.Columns["part"].Cast<string>());
    }

    [Fact]
    public void BadArgumentsAreRefused()
    {
        int[] labels = [0, 1, 0, 1];
        Assert.Throws<ArgumentException>(() => Splitter.StratifiedHoldout(labels, 0.5, 0.2, 0.2, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => Splitter.FoldsByClass(labels, 1, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => Splitter.FoldsByClass(labels, 5, 1));
        Assert.Throws<ArgumentException>(() => Splitter.GroupHoldout(labels, ["a", "a", "b", "b"], 0.5, 0.25, 0.25, 1));
    }

    // Quantile definition 7 of Hyndman and Fan ("Sample quantiles in statistical packages", The American
    // Statistician 50(4), 1996): h = (n-1)q, interpolate between order statistics floor(h) and floor(h)+1.
    [Fact]
    public void QuantilesFollowHyndmanFanDefinition7()
    {
        int[] sorted = [1, 2, 3, 4];
        Assert.Equal(3.7, LengthStats.Quantile(sorted, 0.9), 12);
        Assert.Equal(2.5, LengthStats.Quantile(sorted, 0.5), 12);
        Assert.Equal(1.0, LengthStats.Quantile(sorted, 0), 12);
        Assert.Equal(4.0, LengthStats.Quantile(sorted, 1), 12);
        var s = LengthStats.Of([7, 1, 3]);
        Assert.Equal((3, 1, 7, 11 / 3.0, 3.0), (s.Count, s.Min, s.Max, s.Mean, s.Median));
    }

    // Reference outputs for seed 1234567 from Rosetta Code, task "Pseudo-random numbers/Splitmix64".
    [Fact]
    public void SplitMix64MatchesPublishedSequence()
    {
        var rng = new SplitMix64(1234567);
        ulong[] expected = [0x599ED017FB08FC85, 0x2C73F08458540FA5, 0x883EBCE5A3F27C77, 0x3FBEF740E9177B3F, 0xE3B8346708CB5ECD];
        Assert.Equal(expected, expected.Select(_ => rng.Next()).ToArray());
        Assert.Equal(6457827717110365317UL, expected[0]);
    }

    [Fact]
    public void SplitMix64BoundedDrawsAreUniform()
    {
        // Chi-square goodness of fit with 9 degrees of freedom; 27.88 is the 0.999 quantile (standard table).
        var rng = new SplitMix64(99);
        var counts = new int[10];
        for (int i = 0; i < 100_000; i++) counts[rng.NextInt(10)]++;
        double chi = counts.Sum(c => (c - 10_000.0) * (c - 10_000.0) / 10_000.0);
        Assert.True(chi < 27.88, $"chi-square {chi}");
    }
}

public class GroupStratificationTests
{
    /// <summary>Mean over folds and classes of |fold count − class count / k|.</summary>
    static double Deviation(int[] labels, int[] foldOf, int k)
    {
        int classes = labels.Max() + 1;
        var total = new double[classes];
        var counts = new double[k, classes];
        for (int i = 0; i < labels.Length; i++) { total[labels[i]]++; counts[foldOf[i], labels[i]]++; }
        double sum = 0;
        for (int f = 0; f < k; f++)
            for (int c = 0; c < classes; c++) sum += Math.Abs(counts[f, c] - total[c] / k);
        return sum / (k * classes);
    }

    [Fact]
    public void FoldsByGroupIsFarMoreStratifiedThanRandomWholeGroups()
    {
        // Reference point: assigning whole groups to folds uniformly at random. The greedy assignment should
        // cut the class imbalance across folds by at least half on every one of these inputs.
        for (ulong seed = 1; seed <= 20; seed++)
        {
            var rng = new SplitMix64(seed);
            int groupsCount = 60 + rng.NextInt(60);
            var groupClassBias = Enumerable.Range(0, groupsCount).Select(_ => rng.NextInt(4)).ToArray();
            var groupIds = new List<int>();
            var labels = new List<int>();
            for (int g = 0; g < groupsCount; g++)
            {
                int size = 1 + rng.NextInt(8);
                for (int r = 0; r < size; r++)
                {
                    groupIds.Add(g);
                    labels.Add(rng.NextInt(4) == 0 ? rng.NextInt(4) : groupClassBias[g]);
                }
            }
            var lab = labels.ToArray();
            var groups = groupIds.Select(g => $"g{g}").ToArray();
            const int k = 5;
            var folds = Splitter.FoldsByGroup(lab, groups, k, seed);
            var foldOf = new int[lab.Length];
            for (int f = 0; f < k; f++) foreach (int r in folds[f].Test) foldOf[r] = f;

            var randomFold = Enumerable.Range(0, groupsCount).Select(_ => rng.NextInt(k)).ToArray();
            var randomOf = groupIds.Select(g => randomFold[g]).ToArray();
            double ours = Deviation(lab, foldOf, k), random = Deviation(lab, randomOf, k);
            Assert.True(ours <= random / 2, $"seed {seed}: greedy {ours:F2} vs random groups {random:F2}");
        }
    }
}
