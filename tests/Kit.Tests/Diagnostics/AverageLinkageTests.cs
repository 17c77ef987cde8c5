using Kit.Common;
using Kit.Diagnostics;
using Xunit.Abstractions;

namespace Kit.Tests.Diagnostics;

public class AverageLinkageTests(ITestOutputHelper output)
{
    static double[,] Line(params double[] x)
    {
        var d = new double[x.Length, x.Length];
        for (int i = 0; i < x.Length; i++)
            for (int j = 0; j < x.Length; j++) d[i, j] = Math.Abs(x[i] - x[j]);
        return d;
    }

    [Fact]
    public void Points_on_a_line_merge_at_the_hand_computed_mean_distances()
    {
        // Worked by hand: {0,1} and {5,6} join at 1 each (the tie goes to the pair found first); the two pairs are
        // (5 + 6 + 4 + 5) / 4 = 5 apart; 20 is (20 + 19 + 15 + 14) / 4 = 17 from the four.
        var tree = AverageLinkage.Compute(Line(0, 1, 5, 6, 20));
        Assert.Equal([1.0, 1.0, 5.0, 17.0], tree.Merges.Select(m => m.Height));
        Assert.Equal(new LinkageMerge(0, 1, 1, 2), tree.Merges[0]);
        Assert.Equal(new LinkageMerge(2, 3, 1, 2), tree.Merges[1]);
        Assert.Equal(new LinkageMerge(5, 6, 5, 4), tree.Merges[2]);
        Assert.Equal(new LinkageMerge(4, 7, 17, 5), tree.Merges[3]);
        Assert.Equal([4, 0, 1, 2, 3], tree.LeafOrder);
    }

    [Fact]
    public void Bad_distance_matrices_are_refused_with_the_cell_named()
    {
        Assert.Contains("square", Assert.Throws<ArgumentException>(() => AverageLinkage.Compute(new double[2, 3])).Message);
        var d = Line(0, 1, 2);
        d[0, 2] = 5;
        Assert.Contains("[0, 2] = 5 but [2, 0] = 2", Assert.Throws<ArgumentException>(() => AverageLinkage.Compute(d)).Message);
        d[2, 0] = d[0, 2] = double.NaN;
        Assert.Contains("finite", Assert.Throws<ArgumentException>(() => AverageLinkage.Compute(d)).Message);
        Assert.Equal([0], AverageLinkage.Compute(new double[1, 1]).LeafOrder);
    }

    [Fact]
    public void Classes_confused_with_each_other_end_up_side_by_side()
    {
        // Six classes, invented: 0 ↔ 4 and 1 ↔ 3 ↔ 5 are mixed up, 2 with nothing.
        var shares = new double[6, 6];
        for (int i = 0; i < 6; i++) shares[i, i] = 0.8;
        shares[0, 4] = 0.2; shares[4, 0] = 0.15;
        shares[1, 3] = 0.1; shares[3, 5] = 0.12; shares[5, 1] = 0.08;
        var order = ConfusionOrder.Of(shares).ToList();
        Assert.Equal(1, Math.Abs(order.IndexOf(0) - order.IndexOf(4)));
        var block = new[] { order.IndexOf(1), order.IndexOf(3), order.IndexOf(5) };
        Assert.Equal(2, block.Max() - block.Min());
        Assert.Equal(Enumerable.Range(0, 6), order.Order());
        Assert.Equal(1 - (0.2 + 0.15) / 2, ConfusionOrder.Distances(shares)[0, 4], 12);
    }

    /// <summary>Seeded random distances (no ties, so the merge order is unique) and a 45-class confusion-derived matrix.</summary>
    public static TheoryData<string> Cases => new() { "euclidean", "confusion" };

    static double[,] Distances(string kind, int n = 45)
    {
        var rng = new SplitMix64(17);
        var d = new double[n, n];
        if (kind == "euclidean")
        {
            var x = Enumerable.Range(0, n).Select(_ => new[] { rng.NextGaussian(), rng.NextGaussian(), rng.NextGaussian() }).ToArray();
            for (int i = 0; i < n; i++)
                for (int j = 0; j < n; j++) d[i, j] = Math.Sqrt(x[i].Zip(x[j], (a, b) => (a - b) * (a - b)).Sum());
            return d;
        }
        // Synthetic 45-class confusion shares with nine groups of five classes confused inside their group.
        var shares = new double[n, n];
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++) shares[i, j] = (i / 5 == (j * 7 % n) / 5 ? 0.05 : 0.002) * (0.5 + rng.NextDouble());
            shares[i, i] = 0;
            double off = Enumerable.Range(0, n).Sum(j => shares[i, j]);
            shares[i, i] = 1 - off;
        }
        return ConfusionOrder.Distances(shares);
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Merge_heights_and_leaf_order_agree_with_scipy(string kind)
    {
        var d = Distances(kind);
        var (reference, problem) = ScipyReference.Linkage(d, Path.Combine(Path.GetTempPath(), $"kit-linkage-{Environment.ProcessId}-{kind}"));
        if (reference is null)
        {
            string how = $"SciPy not usable: {problem}. Install: {ScipyReference.Install}. Set {ScipyReference.Variable}=1 to make this a failure.";
            Assert.False(ScipyReference.Required, how);
            output.WriteLine("skipped: " + how);
            return;
        }
        var tree = AverageLinkage.Compute(d);
        // Reference: SciPy's scipy.cluster.hierarchy.linkage(method="average") and leaves_list, version printed here
        // (Debian 12's python3-scipy is 1.10.1).
        output.WriteLine($"scipy {reference.Version}; {kind}: kit heights {ScipyReference.Describe(tree.Merges.Select(m => m.Height).ToArray()[^5..])} (last five)");
        Assert.Equal(reference.Merges.Length, tree.Merges.Count);
        for (int i = 0; i < tree.Merges.Count; i++)
        {
            var (m, r) = (tree.Merges[i], reference.Merges[i]);
            Assert.Equal(r[2], m.Height, 9);
            Assert.Equal((int)r[0], m.First);
            Assert.Equal((int)r[1], m.Second);
            Assert.Equal((int)r[3], m.Size);
        }
        Assert.Equal(reference.Leaves, tree.LeafOrder);
    }
}
