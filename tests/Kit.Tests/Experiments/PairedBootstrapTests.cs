using Kit.Experiments;

namespace Kit.Tests.Experiments;

public class PairedBootstrapTests
{
    static (bool[] A, bool[] B) Outcomes(int bothRight, int onlyA, int onlyB, int bothWrong)
    {
        var a = new List<bool>();
        var b = new List<bool>();
        void Add(int n, bool x, bool y) { for (int i = 0; i < n; i++) { a.Add(x); b.Add(y); } }
        Add(bothRight, true, true); Add(onlyA, true, false); Add(onlyB, false, true); Add(bothWrong, false, false);
        return (a.ToArray(), b.ToArray());
    }

    [Fact]
    public void Interval_width_matches_the_normal_theory_of_paired_proportions()
    {
        // For paired items the difference of accuracies has variance (p_a + p_b − (p_a − p_b)²) / n, where p_a and
        // p_b are the shares of items only A (only B) gets right (multinomial variance of the per-item difference,
        // derived here; the same form as Agresti 2002 §10.1.1's variance for a difference of dependent proportions).
        var (a, b) = Outcomes(1500, 200, 100, 200);
        var r = PairedBootstrap.AccuracyDifference(a, b, replicates: 4000, seed: 7);
        double n = 2000, pa = 0.1, pb = 0.05;
        double sd = Math.Sqrt((pa + pb - (pa - pb) * (pa - pb)) / n);
        Assert.Equal(0.05, r.Difference, 12);
        Assert.Equal(2 * 1.96 * sd, r.High - r.Low, 0.1 * 2 * 1.96 * sd); // within 10 % of the normal-theory width
        Assert.InRange(0.05 - r.Low, 0.8 * 1.96 * sd, 1.2 * 1.96 * sd);
    }

    [Fact]
    public void Identical_classifiers_have_a_zero_interval_and_the_seed_fixes_the_result()
    {
        var (a, _) = Outcomes(30, 10, 0, 5);
        var same = PairedBootstrap.AccuracyDifference(a, a);
        Assert.Equal((0.0, 0.0, 0.0), (same.Difference, same.Low, same.High));
        var (x, y) = Outcomes(40, 9, 4, 7);
        Assert.Equal(PairedBootstrap.AccuracyDifference(x, y, seed: 3), PairedBootstrap.AccuracyDifference(x, y, seed: 3));
        // The seed does steer the resampling (the bounds sit on a 1/60 lattice, so compare several seeds).
        var bounds = Enumerable.Range(1, 10).Select(s => PairedBootstrap.AccuracyDifference(x, y, replicates: 200, seed: (ulong)s))
            .Select(r => (r.Low, r.High)).Distinct().Count();
        Assert.True(bounds > 1);
    }

    [Fact]
    public void Pairing_makes_the_interval_narrower_than_independent_samples_would()
    {
        // Two classifiers that agree on almost everything: paired, the difference is pinned down; treating the
        // two accuracies (0.805 and 0.8) as independent would give a half-width near 1.96·√(2·0.8·0.2/2000) ≈ 0.025.
        var (a, b) = Outcomes(1600, 10, 0, 390);
        var r = PairedBootstrap.AccuracyDifference(a, b, replicates: 2000, seed: 1);
        Assert.True(r.High - r.Low < 0.012, $"paired interval [{r.Low}, {r.High}] should be far narrower than ±0.025");
        Assert.True(r.Low > 0, "A is right on 10 items B misses and never the reverse: the interval excludes 0");
    }
}
