using Kit.Diagnostics;

namespace Kit.Tests.Diagnostics;

public class ProjectionTests
{
    [Fact]
    public void Sequence_projection_carries_label_text_and_correctness()
    {
        var (x, species) = PcaTests.Iris();
        string[] names = ["setosa", "versicolor", "virginica"];
        var labels = species.Select(s => Array.IndexOf(names, s)).ToArray();
        var predicted = labels.Select((y, i) => i % 10 == 0 ? (y + 1) % 3 : y).ToArray();
        var texts = Enumerable.Range(0, x.Length).Select(i => $"row {i}").ToArray();
        var p = Projection.OfSequences(x, labels, names, ProjectionMethod.Pca, predicted, texts);

        Assert.Equal(150, p.Points.Count);
        Assert.Equal(0.92461872, p.VarianceShare[0], 6);
        Assert.False(p.Points[0].Correct);
        Assert.True(p.Points[1].Correct);
        Assert.Equal("virginica", p.Points[149].Label);
        var pca = Pca.Of(x, 2);
        Assert.Equal(pca.Project([x[7]])[0][1], p.Points[7].Y, 12);
        var frame = p.ToDataFrame();
        Assert.Equal(150, frame.Rows.Count);
        Assert.Equal("row 3", frame["Text"][3]);
        Assert.Equal(false, frame["Correct"][10]);
    }

    [Fact]
    public void Token_projection_by_tsne_has_one_point_per_token()
    {
        var (x, _) = TsneTests.Clusters(3, 30, 8, seed: 6);
        var tokens = Enumerable.Range(0, x.Length).Select(i => $"t{i}").ToArray();
        var p = Projection.OfTokens(x, tokens, ProjectionMethod.Tsne, new TsneOptions { Perplexity = 8, Iterations = 300 });
        Assert.Equal(x.Length, p.Points.Count);
        Assert.Equal("t5", p.Points[5].Text);
        Assert.Null(p.Points[5].Correct);
        Assert.Empty(p.VarianceShare);
        double trust = NeighbourPreservation.Trustworthiness(x, p.Points.Select(q => new[] { q.X, q.Y }).ToArray(), 5);
        // 300 iterations on 8-D isotropic clusters: the within-cluster order cannot all survive in 2-D; 0.8 is
        // common practice, no source (a random layout scores about 0.5; the thorough check is in TsneTests).
        Assert.True(trust > 0.8, $"trustworthiness {trust}");
    }

    [Fact]
    public void Mismatched_metadata_is_rejected()
    {
        double[][] x = [[1, 2], [3, 4], [5, 7]];
        Assert.Throws<ArgumentException>(() => Projection.OfTokens(x, ["a", "b"], ProjectionMethod.Pca));
        Assert.Throws<ArgumentException>(() => Projection.OfSequences(x, [0, 1, 0], ["p", "q"], ProjectionMethod.Pca, predicted: [0, 1]));
        Assert.Throws<ArgumentOutOfRangeException>(() => Projection.OfSequences(x, [0, 1, 5], ["p", "q"], ProjectionMethod.Pca));
    }
}
