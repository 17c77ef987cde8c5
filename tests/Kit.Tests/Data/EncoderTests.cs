using Kit.Data;

namespace Kit.Tests.Data;

public class EncoderTests
{
    static readonly CharacterTokenizer Chars = new();
    static readonly Vocabulary Letters = Vocabulary.FromTokens("abcdefgh".Select(c => c.ToString()));

    static int[] Ids(string s) => s.Select(c => Letters.Id(c.ToString())).ToArray();

    [Theory]
    [InlineData(TruncationPolicy.KeepHead, "abcd")]
    [InlineData(TruncationPolicy.KeepTail, "efgh")]
    [InlineData(TruncationPolicy.HeadAndTail, "abgh")]
    public void TruncationPoliciesKeepTheStatedTokens(TruncationPolicy policy, string kept)
    {
        var (set, report) = Encoder.Encode(["abcdefgh", "ab"], [0, 1], Chars, Letters, 4, policy);
        Assert.Equal(Ids(kept), set[0].ToArray());
        Assert.Equal(Ids("ab"), set[1].ToArray());
        Assert.Equal(1, report.TruncatedRows);
        Assert.Equal(4, report.TokensDropped);
        Assert.Equal(8, report.LongestBefore);
        Assert.Equal(6, report.TokensKept);
    }

    [Fact]
    public void HeadAndTailWithOddLengthKeepsTheExtraTokenAtTheHead()
    {
        var (set, _) = Encoder.Encode(["abcdefgh"], [0], Chars, Letters, 5, TruncationPolicy.HeadAndTail);
        Assert.Equal(Ids("abcgh"), set[0].ToArray());
    }

    [Fact]
    public void UnknownTokensMapToOneAndEmptyRowsAreCounted()
    {
        var (set, report) = Encoder.Encode(["azb", " "], [0, 0], new WordTokenizer(), Vocabulary.Build([["b"]]), 10, TruncationPolicy.KeepHead);
        Assert.Equal([Vocabulary.UnknownId], set[0].ToArray());
        Assert.Equal(0, set.Length(1));
        Assert.Equal(1, report.EmptyRows);
        Assert.Contains("1 row(s) have no tokens", report.ToString());
    }

    [Fact]
    public void StorageIsContiguous()
    {
        var (set, _) = Encoder.Encode(["abc", "de", "f"], [2, 0, 1], Chars, Letters, 8, TruncationPolicy.KeepHead, sourceRows: [10, 11, 12]);
        Assert.Equal([0, 3, 5, 6], set.Offsets);
        Assert.Equal(Ids("abcdef"), set.Tokens);
        Assert.Equal([2, 0, 1], set.Labels);
        Assert.Equal([10, 11, 12], set.SourceRows);
    }

    [Fact]
    public void TablesEncodeWithAGivenLabelMap()
    {
        var table = new LabelledTable("mem", ["ab", "c"], ["zeta", "alpha"]);
        var (set, _) = Encoder.Encode(table, new LabelMap(["alpha", "beta", "zeta"]), Chars, Letters, 8, TruncationPolicy.KeepHead);
        Assert.Equal([2, 0], set.Labels);
        Assert.Equal(Ids("abc"), set.Tokens);
        var e = Assert.Throws<DataError>(() => Encoder.Encode(table, new LabelMap(["alpha"]), Chars, Letters, 8, TruncationPolicy.KeepHead));
        Assert.Equal("mem:1: label 'zeta' is not one of the known classes (alpha)", e.Message);
    }
}
