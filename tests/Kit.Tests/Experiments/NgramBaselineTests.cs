using Kit.Data;
using Kit.Experiments;
using Kit.Training;

namespace Kit.Tests.Experiments;

/// <summary>The n-gram features, naive Bayes and logistic regression baselines, and their file.</summary>
public class NgramBaselineTests
{
    static IReadOnlyList<string> Words(string s) => s.Split(' ');

    static readonly NgramScheme WordCounts = new(NgramUnit.Word, 1, 1, NgramWeighting.Count);

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
        var features = NgramFeatures.Fit(train, WordCounts);
        var nb = NgramNaiveBayes.Fit(features.Transform(train), [0, 0, 0, 1], classes: 2, smoothing: 1);
        var doc = features.Transform([Words("Chinese Chinese Chinese Tokyo Japan")]);
        var score = nb.ClassLogScores(doc.ColumnsOf(0), doc.ValuesOf(0));
        double c = 0.75 * Math.Pow(3.0 / 7, 3) * Math.Pow(1.0 / 14, 2), not = 0.25 * Math.Pow(2.0 / 9, 5);
        Assert.Equal(Math.Log(c), score[0], 12);
        Assert.Equal(Math.Log(not), score[1], 12);
        Assert.Equal(0.0003, c, 4);
        Assert.Equal(0.0001, not, 4);
        Assert.Equal(c / (c + not), nb.Probabilities(doc.ColumnsOf(0), doc.ValuesOf(0))[0], 12);
        Assert.Equal(6, features.Count);
        Assert.Equal(6 * 2 + 2, nb.ParameterCount);
        // An n-gram never seen in training is not a feature: adding one changes nothing.
        var more = features.Transform([Words("Chinese Chinese Chinese Tokyo Japan Osaka")]);
        Assert.Equal(score, nb.ClassLogScores(more.ColumnsOf(0), more.ValuesOf(0)));
    }

    [Fact]
    public void Character_ngrams_are_cut_inside_words_with_boundary_marks_and_word_ngrams_join_neighbours()
    {
        var scheme = new NgramScheme(NgramUnit.Character, 1, 3);
        var grams = NgramFeatures.Extract(new CharacterTokenizer().Split("ab c"), scheme).ToArray();
        Assert.Equal([" ", "a", "b", " ", " a", "ab", "b ", " ab", "ab ", " ", "c", " ", " c", "c ", " c "], grams);
        // A longer n than the marked word gives nothing at that order.
        Assert.Empty(NgramFeatures.Extract(["a"], new NgramScheme(NgramUnit.Character, 4, 5)));
        var words = NgramFeatures.Extract(Words("red pump leaks"), new NgramScheme(NgramUnit.Word, 1, 2)).ToArray();
        Assert.Equal(["red", "pump", "leaks", "red\u0001pump", "pump\u0001leaks"], words);
        Assert.Equal(new NgramScheme(NgramUnit.Character, 1, 5), NgramScheme.ForTokenizer(TokenizerKind.Character));
        Assert.Equal(new NgramScheme(NgramUnit.Word, 1, 2), NgramScheme.ForTokenizer(TokenizerKind.Word));
    }

    [Fact]
    public void Tf_idf_weights_follow_the_formulas_worked_by_hand()
    {
        // Three rows over words: idf = ln((1 + n) / (1 + df)) + 1, tf = 1 + ln(count), then unit length.
        IReadOnlyList<string>[] rows = [Words("a a b"), Words("a c"), Words("c c c")];
        var features = NgramFeatures.Fit(rows, new NgramScheme(NgramUnit.Word, 1, 1));
        Assert.Equal(["a", "b", "c"], features.Ngrams);
        double idfA = Math.Log(4.0 / 3) + 1, idfB = Math.Log(4.0 / 2) + 1, idfC = Math.Log(4.0 / 3) + 1;
        Assert.Equal([idfA, idfB, idfC], features.Idf.ToArray());
        var x = features.Transform(rows);
        double a = (1 + Math.Log(2)) * idfA, b = idfB, norm = Math.Sqrt(a * a + b * b);
        Assert.Equal([0, 1], x.ColumnsOf(0).ToArray());
        Assert.Equal(a / norm, x.ValuesOf(0)[0], 14);
        Assert.Equal(b / norm, x.ValuesOf(0)[1], 14);
        Assert.Equal([2], x.ColumnsOf(2).ToArray());
        Assert.Equal(1.0, x.ValuesOf(2)[0], 14);
    }

    [Fact]
    public void Logistic_regression_reaches_the_optimum_the_gradient_equations_define_and_repeats_bit_for_bit()
    {
        // At the minimum of Σ_i −log p_i[y_i] + (λ/2)‖W‖² the gradient is zero: for every feature j and class k,
        // Σ_i x_ij (p_ik − [y_i = k]) + λ W_jk = 0, and Σ_i (p_ik − [y_i = k]) = 0 for the unpenalised intercepts
        // (the standard softmax cross-entropy gradient). Checked here with plain arrays, apart from the solver.
        var tok = new CharacterTokenizer();
        string[] texts = ["pump-01", "pump-07", "valve-2", "valve-9", "fan-x", "fan-y", "pump-v", "valve-f"];
        int[] y = [0, 0, 1, 1, 2, 2, 0, 1];
        var rows = texts.Select(t => tok.Split(t)).ToArray();
        var features = NgramFeatures.Fit(rows, new NgramScheme(NgramUnit.Character, 1, 3));
        var x = features.Transform(rows);
        const double l2 = 0.5;
        var lr = NgramLogisticRegression.Fit(x, y, 3, l2, maxIterations: 2000, tolerance: 1e-10);
        Assert.True(lr.Converged);
        var w = lr.Weights.ToArray();
        var p = lr.Probabilities(x);
        var gradient = new double[features.Count, 3];
        var interceptGradient = new double[3];
        for (int j = 0; j < features.Count; j++) for (int k = 0; k < 3; k++) gradient[j, k] = l2 * w[j * 3 + k];
        for (int i = 0; i < texts.Length; i++)
            for (int k = 0; k < 3; k++)
            {
                double residual = p[i][k] - (y[i] == k ? 1 : 0);
                interceptGradient[k] += residual;
                var cols = x.ColumnsOf(i); var vals = x.ValuesOf(i);
                for (int t = 0; t < cols.Length; t++) gradient[cols[t], k] += vals[t] * residual;
            }
        foreach (double g in gradient) Assert.True(Math.Abs(g) < 1e-7, $"gradient entry {g}");
        foreach (double g in interceptGradient) Assert.True(Math.Abs(g) < 1e-7, $"intercept gradient {g}");
        Assert.All(p.Select((row, i) => Array.IndexOf(row, row.Max()) == y[i]), Assert.True);
        var again = NgramLogisticRegression.Fit(x, y, 3, l2, maxIterations: 2000, tolerance: 1e-10);
        Assert.Equal(lr.Weights.ToArray(), again.Weights.ToArray());
    }

    [Theory]
    [InlineData(BaselineKind.NaiveBayes)]
    [InlineData(BaselineKind.LogisticRegression)]
    public void Suffixes_separate_two_classes_and_the_saved_file_scores_the_same(BaselineKind kind)
    {
        var tok = new CharacterTokenizer();
        string[] texts = ["lamp-ix", "desk-ix", "door-ix", "roof-oq", "wall-oq", "sink-oq", "gate-oq"];
        int[] y = [0, 0, 0, 1, 1, 1, 1];
        var baseline = NgramBaseline.Fit(kind, texts.Select(tok.Split).ToArray(), y, 2, NgramScheme.ForTokenizer(TokenizerKind.Character));
        var p = baseline.Probabilities([tok.Split("beam-ix"), tok.Split("beam-oq")]);
        Assert.True(p[0][0] > 0.5, $"beam-ix: {p[0][0]}");
        Assert.True(p[1][1] > 0.5, $"beam-oq: {p[1][1]}");

        var file = new NgramModelFile { Baseline = baseline, Tokenizer = TokenizerSpec.Of(tok), Labels = new LabelMap(["ix", "oq"]) };
        var bytes = file.ToBytes();
        var loaded = NgramModelFile.FromBytes(bytes, "memory");
        Assert.Equal(bytes, loaded.ToBytes());
        string[] probe = ["beam-ix", "", "zzzz", "roof-ix"];
        var a = file.Score(probe);
        var b = loaded.Score(probe);
        Assert.Equal(a.Probabilities, b.Probabilities);
        Assert.Equal([ScoreFlag.None, ScoreFlag.Empty, ScoreFlag.AllUnknown, ScoreFlag.None], b.Flags);
        Assert.Equal(p[0], b.Probabilities[0]);
        bytes[^40] ^= 1;
        Assert.Contains("memory", Assert.Throws<BundleError>(() => NgramModelFile.FromBytes(bytes, "memory")).Message);
    }

    [Fact]
    public void Bad_arguments_are_refused_with_the_reason()
    {
        var x = NgramFeatures.Fit([["a"]], WordCounts).Transform([["a"]]);
        Assert.Contains("classes", Assert.Throws<ArgumentOutOfRangeException>(() => NgramNaiveBayes.Fit(x, [0], 1)).Message);
        Assert.Contains("outside", Assert.Throws<ArgumentOutOfRangeException>(() => NgramNaiveBayes.Fit(x, [3], 2)).Message);
        Assert.Contains("smoothing", Assert.Throws<ArgumentOutOfRangeException>(() => NgramNaiveBayes.Fit(x, [0], 2, smoothing: 0)).Message);
        Assert.Throws<ArgumentException>(() => NgramNaiveBayes.Fit(x, [0, 1], 2));
        Assert.Contains("L2", Assert.Throws<ArgumentOutOfRangeException>(() => NgramLogisticRegression.Fit(x, [0], 2, l2: -1)).Message);
        Assert.Contains("outside", Assert.Throws<ArgumentOutOfRangeException>(() => NgramLogisticRegression.Fit(x, [2], 2)).Message);
        Assert.Throws<ArgumentException>(() => new NgramScheme(NgramUnit.Word, 2, 1).Validate());
    }
}
