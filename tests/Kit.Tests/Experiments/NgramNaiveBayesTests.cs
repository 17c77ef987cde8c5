using Kit.Data;
using Kit.Experiments;

namespace Kit.Tests.Experiments;

public class NgramNaiveBayesTests
{
    static IReadOnlyList<string> Words(string s) => s.Split(' ');

    [Fact]
    public void Textbook_worked_example_of_multinomial_naive_Bayes()
    {
        // Manning, Raghavan and Schütze, Introduction to Information Retrieval (2008), Example 13.1 / Table 13.1:
        // class "china" (c) has "Chinese Beijing Chinese", "Chinese Chinese Shanghai", "Chinese Macao"; class "not"
        // has "Tokyo Japan Chinese"; with add-one smoothing over V = 6 words, P̂(Chinese|c) = 3/7,
        // P̂(Tokyo|c) = P̂(Japan|c) = 1/14, P̂(Chinese|not) = P̂(Tokyo|not) = P̂(Japan|not) = 2/9, priors 3/4 and 1/4,
        // and the test document "Chinese Chinese Chinese Tokyo Japan" scores 3/4 · (3/7)³ · (1/14)² ≈ 0.0003 for c
        // against 1/4 · (2/9)³ · (2/9)² ≈ 0.0001 (the example's figures, from memory; recomputed here from its counts).
        var train = new[] { "Chinese Beijing Chinese", "Chinese Chinese Shanghai", "Chinese Macao", "Tokyo Japan Chinese" }.Select(Words).ToArray();
        var nb = NgramNaiveBayes.Fit(train, [0, 0, 0, 1], classes: 2, minN: 1, maxN: 1, alpha: 1);
        var score = nb.JointLogLikelihood(Words("Chinese Chinese Chinese Tokyo Japan"));
        double c = 0.75 * Math.Pow(3.0 / 7, 3) * Math.Pow(1.0 / 14, 2), not = 0.25 * Math.Pow(2.0 / 9, 5);
        Assert.Equal(Math.Log(c), score[0], 12);
        Assert.Equal(Math.Log(not), score[1], 12);
        Assert.Equal(0.0003, c, 4);
        Assert.Equal(0.0001, not, 4);
        var p = nb.Probabilities(Words("Chinese Chinese Chinese Tokyo Japan"));
        Assert.Equal(c / (c + not), p[0], 12);
        Assert.Equal(6, nb.NgramCount);
        Assert.Equal(6 * 2 + 2, nb.ParameterCount);
        // An n-gram never seen in training is ignored: adding one changes nothing.
        Assert.Equal(score, nb.JointLogLikelihood(Words("Chinese Chinese Chinese Tokyo Japan Osaka")));
        Assert.Equal(Math.Log(1.0 / 14), nb.LogUnseen(0), 12);
    }

    [Fact]
    public void Character_ngrams_carry_start_and_end_marks()
    {
        var grams = NgramNaiveBayes.Ngrams(new CharacterTokenizer().Split("ab"), 1, 3).ToArray();
        Assert.Equal(["a", "b", "\u0002\u0001a", "a\u0001b", "b\u0001\u0003", "\u0002\u0001a\u0001b", "a\u0001b\u0001\u0003"], grams);
        // A longer n than the text gives nothing at that order, not an error.
        Assert.Equal(["a"], NgramNaiveBayes.Ngrams(["a"], 1, 1).ToArray());
        Assert.Empty(NgramNaiveBayes.Ngrams(["a"], 4, 4));
    }

    [Fact]
    public void Suffixes_separate_two_classes_the_prior_alone_cannot()
    {
        var tok = new CharacterTokenizer();
        string[] texts = ["lamp-ix", "desk-ix", "door-ix", "roof-oq", "wall-oq", "sink-oq", "gate-oq"];
        int[] y = [0, 0, 0, 1, 1, 1, 1];
        var nb = NgramNaiveBayes.Fit(texts.Select(tok.Split).ToArray(), y, classes: 2);
        Assert.True(nb.Probabilities(tok.Split("beam-ix"))[0] > 0.9);
        Assert.True(nb.Probabilities(tok.Split("beam-oq"))[1] > 0.9);
    }

    [Fact]
    public void Bad_arguments_are_refused_with_the_reason()
    {
        IReadOnlyList<string>[] one = [["a"]];
        Assert.Contains("classes", Assert.Throws<ArgumentOutOfRangeException>(() => NgramNaiveBayes.Fit(one, [0], 1)).Message);
        Assert.Contains("outside", Assert.Throws<ArgumentOutOfRangeException>(() => NgramNaiveBayes.Fit(one, [3], 2)).Message);
        Assert.Contains("alpha", Assert.Throws<ArgumentOutOfRangeException>(() => NgramNaiveBayes.Fit(one, [0], 2, alpha: 0)).Message);
        Assert.Throws<ArgumentException>(() => NgramNaiveBayes.Fit(one, [0, 1], 2));
    }
}
