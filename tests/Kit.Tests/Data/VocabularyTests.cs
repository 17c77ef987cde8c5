using Kit.Data;

namespace Kit.Tests.Data;

public class VocabularyTests
{
    static readonly IReadOnlyList<string>[] Pieces = [["b", "a", "c"], ["a", "b"], ["a", "d"]];

    [Fact]
    public void IdsFollowCountThenOrdinalOrder()
    {
        var v = Vocabulary.Build(Pieces);
        // a ×3, b ×2, then c and d ×1 in ordinal order.
        Assert.Equal(["<pad>", "<unk>", "a", "b", "c", "d"], v.Tokens);
        Assert.Equal(2, v.Id("a"));
        Assert.Equal(Vocabulary.UnknownId, v.Id("zzz"));
        Assert.Equal(3, v.TrainingCount(2));
    }

    [Fact]
    public void MinCountAndMaxSize()
    {
        Assert.Equal(["<pad>", "<unk>", "a", "b"], Vocabulary.Build(Pieces, minCount: 2).Tokens);
        Assert.Equal(["<pad>", "<unk>", "a"], Vocabulary.Build(Pieces, maxSize: 3).Tokens);
        Assert.Throws<ArgumentOutOfRangeException>(() => Vocabulary.Build(Pieces, maxSize: 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => Vocabulary.Build(Pieces, minCount: 0));
    }

    [Fact]
    public void CoverageCountsUnknownOccurrencesAndTypes()
    {
        var v = Vocabulary.Build(Pieces, minCount: 2);
        var c = v.Coverage([["a", "c", "c"], ["e"]], "test");
        Assert.Equal(4, c.Tokens);
        Assert.Equal(3, c.UnknownTokens);
        Assert.Equal(0.75, c.UnknownRate, 12);
        Assert.Equal(3, c.Types);
        Assert.Equal(2, c.UnknownTypes);
        Assert.Equal("test", c.ToDataFrame().Columns["part"][0]);
    }

    [Fact]
    public void SaveAndLoadRoundTrip()
    {
        var v = Vocabulary.Build(Pieces, minCount: 1, maxSize: 5);
        var path = Path.Combine(Path.GetTempPath(), $"kit-vocab-{Guid.NewGuid():N}.json");
        try
        {
            v.Save(path);
            var back = Vocabulary.Load(path);
            Assert.Equal(v.Tokens, back.Tokens);
            Assert.Equal(5, back.MaxSize);
            Assert.Equal(v.TrainingCount(3), back.TrainingCount(3));
            Assert.Contains("\"version\":1", File.ReadAllText(path));
        }
        finally { File.Delete(path); }
    }

    [Fact]
    public void LoadRefusesOtherVersionsAndBrokenFiles()
    {
        var json = Vocabulary.Build(Pieces).ToJson();
        Assert.Contains("version 2 is not supported", Assert.Throws<DataError>(() => Vocabulary.FromJson(json.Replace("\"version\":1", "\"version\":2"))).Message);
        Assert.Contains("not a vocabulary file", Assert.Throws<DataError>(() => Vocabulary.FromJson("{\"format\":\"other\"}")).Message);
        Assert.Contains("invalid JSON", Assert.Throws<DataError>(() => Vocabulary.FromJson("{\"format\":")).Message);
        Assert.Contains("appears twice", Assert.Throws<DataError>(() => Vocabulary.FromJson(
            "{\"format\":\"kit-vocabulary\",\"version\":1,\"tokens\":[\"<pad>\",\"<unk>\",\"a\",\"a\"],\"counts\":[0,0,1,1]}")).Message);
        Assert.Contains("must start with", Assert.Throws<DataError>(() => Vocabulary.FromJson(
            "{\"format\":\"kit-vocabulary\",\"version\":1,\"tokens\":[\"a\"],\"counts\":[0]}")).Message);
    }
}

public class VocabularyFromSplitTests
{
    [Fact]
    public void BuiltFromTrainRowsOnlyAndCoverageIsPerPart()
    {
        string[] texts = ["ab", "ab", "cd", "ax"];
        var split = new Split([0, 1], [2], [3], SplitSummary.Of("fixed", 0, [0, 0, 0, 0], null));
        var chars = new CharacterTokenizer();
        var v = Vocabulary.BuildFromTrain(texts, split, chars);
        Assert.Equal(["<pad>", "<unk>", "a", "b"], v.Tokens);
        var cov = v.CoverageByPart(texts, split, chars);
        Assert.Equal(["train", "validation", "test"], cov.Select(c => c.Part));
        Assert.Equal([0.0, 1.0, 0.5], cov.Select(c => c.UnknownRate));
    }
}
