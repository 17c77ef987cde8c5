using Kit.Data;

namespace Kit.Tests.Data;

public class DatasetProfileTests
{
    [Fact]
    public void ProfileCountsClassesLengthsAndCoverage()
    {
        var table = new LabelledTable("mem", ["ab", "abc", "a", "aaaa", "bcd"], ["y", "x", "x", "x", "y"]);
        var p = DatasetProfile.Compute(table, new CharacterTokenizer());
        Assert.Equal(["x", "y"], p.Classes.Select(c => c.Name));
        Assert.Equal([3, 2], p.Classes.Select(c => c.Rows));
        Assert.Equal(1.5, p.ImbalanceRatio, 12);
        Assert.Equal([2, 3, 1, 4, 3], p.RowLengths);
        Assert.Equal((1, 4, 3.0), (p.Lengths.Min, p.Lengths.Max, p.Lengths.Median));
        Assert.Equal((1, 4), (p.Classes[0].Lengths.Min, p.Classes[0].Lengths.Max));
        // a ×7, b ×3, c ×2, d ×1: 13 occurrences; top 2 types give 10/13 < 90 %, top 3 give 12/13 ≥ 90 %.
        Assert.Equal((13L, 4, 1, 3, 4, 4), (p.Coverage.Occurrences, p.Coverage.Types, p.Coverage.Singletons,
            p.Coverage.TypesFor90, p.Coverage.TypesFor95, p.Coverage.TypesFor99));
        Assert.Equal(5, p.Histogram.Sum(b => b.Rows));
        Assert.Equal([1, 0], p.Histogram.Single(b => b.From == 1).RowsByClass);
        Assert.Equal(2, p.ToDataFrame().Rows.Count);
        Assert.Equal(p.Histogram.Count * 2, p.HistogramToDataFrame().Rows.Count);
        Assert.Equal(4, p.CoverageToDataFrame().Columns["types"][0]);
    }

    [Fact]
    public void WideLengthRangesAreBinned()
    {
        var texts = Enumerable.Range(1, 100).Select(n => new string('a', n)).ToArray();
        var p = DatasetProfile.Compute(new LabelledTable("mem", texts, texts.Select(_ => "k").ToArray()), new CharacterTokenizer());
        Assert.Equal(DatasetProfile.HistogramBins, p.Histogram.Count);
        Assert.All(p.Histogram, b => Assert.Equal(5, b.Rows));
    }
}
