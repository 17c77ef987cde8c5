using Kit.Data;

namespace Kit.Tests.Data;

public class LeakageAuditTests
{
    static LabelledTable Table(string[] texts, string[] labels, string[]? groups = null) =>
        new("mem", texts, labels, groups, lines: Enumerable.Range(2, texts.Length).ToArray());

    static Split Parts(int[] train, int[] validation, int[] test) =>
        new(train, validation, test, SplitSummary.Of("fixed", 0, new int[train.Length + validation.Length + test.Length], null));

    [Fact]
    public void FindsExactNormalisedAndConflictingTexts()
    {
        var table = Table(
            ["alpha", "Beta  One", "gamma", "alpha", "beta one", "\uFF27amma", "delta", "delta", "solo"],
            ["x", "x", "y", "x", "x", "y", "x", "y", "y"]);
        // train 0,1,2,6 | validation 3,4 | test 5,7,8
        var report = LeakageAudit.Run(table, Parts([0, 1, 2, 6], [3, 4], [5, 7, 8]));

        var exact = report[LeakFinding.ExactAcrossParts];
        Assert.Equal((2, 2), (exact.Texts, exact.Rows)); // "alpha" (train→validation) and "delta" (train→test)
        Assert.Equal("alpha", exact.Examples[0].Text);
        Assert.Equal([2, 5], exact.Examples[0].Lines);

        // "beta one" matches "Beta  One" after case and white space; full-width G (U+FF27) matches "gamma" under NFKC.
        var normalised = report[LeakFinding.NormalisedAcrossParts];
        Assert.Equal((2, 2), (normalised.Texts, normalised.Rows));

        var conflicts = report[LeakFinding.ConflictingLabels];
        Assert.Equal((1, 2), (conflicts.Texts, conflicts.Rows));
        Assert.Equal("delta", conflicts.Examples[0].Text);
        Assert.Equal("labels x ×1, y ×1", conflicts.Examples[0].Detail);
        Assert.False(report.Clean);
        Assert.Equal(3, report.ToDataFrame().Rows.Count);
        Assert.Equal(5, report.ExamplesToDataFrame().Rows.Count);
    }

    [Fact]
    public void DuplicatesInsideOnePartAreNotLeakage()
    {
        var table = Table(["a", "a", "b", "c"], ["x", "x", "y", "y"]);
        var report = LeakageAudit.Run(table, Parts([0, 1, 2], [], [3]));
        Assert.True(report.Clean);
        Assert.All(report.Findings, f => Assert.Equal(0, f.Rows));
    }

    [Fact]
    public void CountsEveryRepeatingRowNotJustDistinctTexts()
    {
        var table = Table(["a", "a", "a", "a"], ["x", "x", "x", "x"]);
        var f = LeakageAudit.Run(table, Parts([0], [1], [2, 3]))[LeakFinding.ExactAcrossParts];
        Assert.Equal((1, 3), (f.Texts, f.Rows));
    }

    [Fact]
    public void GroupsInTwoPartsAreReported()
    {
        var table = Table(["a", "b", "c", "d"], ["x", "y", "x", "y"], ["g1", "g1", "g2", "g3"]);
        var f = LeakageAudit.Run(table, Parts([0, 2], [1], [3]))[LeakFinding.GroupAcrossParts];
        Assert.Equal((1, 1), (f.Texts, f.Rows));
        Assert.Equal("group g1", f.Examples[0].Text);
        // A group-aware split of the same table never triggers it.
        var groupSplit = Splitter.GroupHoldout([0, 1, 0, 1], table.Groups!.ToArray(), 0.34, 0.33, 0.33, 5);
        Assert.Equal(0, LeakageAudit.Run(table, groupSplit)[LeakFinding.GroupAcrossParts].Rows);
    }

    [Fact]
    public void TextKeyNormalisesCaseSpaceAndCompatibilityForms()
    {
        Assert.Equal("hello world", TextKey.Normalise("  Hello\t\u00A0WORLD \n"));
        Assert.Equal("fi", TextKey.Normalise("\uFB01")); // the "fi" ligature decomposes under NFKC (Unicode UAX #15).
        Assert.Equal(TextKey.Normalise("e\u0301"), TextKey.Normalise("\u00C9"));
    }
}
