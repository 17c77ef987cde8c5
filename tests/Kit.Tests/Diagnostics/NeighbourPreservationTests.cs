using Kit.Common;
using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class NeighbourPreservationTests
{
    // Venna and Kaski (2001), trustworthiness, worked by hand. Input on a line x = 0, 1, 3, 6, 10 (no distance
    // ties); the layout swaps the last two points: y = 0, 1, 3, 10, 6. With k = 1, points 3 and 4 get a layout
    // neighbour (4 and 2) of input rank 2, each adding 2 − 1 = 1:
    //   T = 1 − 2 / (n k (2n − 3k − 1)) · 2 = 1 − 2/30 · 2 = 0.866667; kNN preservation = 3/5.
    [Fact]
    public void Matches_the_hand_worked_example()
    {
        double[][] input = [[0], [1], [3], [6], [10]];
        double[][] layout = [[0], [1], [3], [10], [6]];
        Assert.Equal(1 - 4.0 / 30, NeighbourPreservation.Trustworthiness(input, layout, 1), 12);
        Assert.Equal(0.6, NeighbourPreservation.KnnPreservation(input, layout, 1), 12);
        Assert.Equal(1, NeighbourPreservation.Trustworthiness(input, input, 1), 12);
    }

    [Fact]
    public void A_random_layout_scores_near_one_half()
    {
        var (x, _) = TsneTests.Clusters(4, 50, 10, seed: 3);
        var rng = new SplitMix64(2);
        var layout = x.Select(_ => new[] { rng.NextGaussian(), rng.NextGaussian() }).ToArray();
        Assert.InRange(NeighbourPreservation.Trustworthiness(x, layout, 10), 0.4, 0.6);
        Assert.Throws<ArgumentOutOfRangeException>(() => NeighbourPreservation.Trustworthiness(x, layout, 150));   // 2n − 3k − 1 < 0
    }
}
