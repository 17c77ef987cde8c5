using Kit.Data;

namespace Kit.Tests.Data;

/// <summary>Prepared data owns sampling, the split, the vocabulary and the position ↔ table-row bookkeeping.</summary>
public sealed class PreparedDataTests
{
    static LabelledTable Table(int n = 120, bool withSplit = false)
    {
        var texts = Enumerable.Range(0, n).Select(i => $"{(i % 3 == 0 ? "ab" : "cd")}{i}").ToArray();
        var labels = Enumerable.Range(0, n).Select(i => i % 3 == 0 ? "x" : "y").ToArray();
        var groups = Enumerable.Range(0, n).Select(i => $"g{i % 17}").ToArray();
        var splits = withSplit ? Enumerable.Range(0, n).Select(i => (i % 10) switch { < 6 => "train", < 8 => "validation", _ => "test" }).ToArray() : null;
        return new LabelledTable("mem.csv", texts, labels, groups, splits);
    }

    [Fact]
    public void Positions_map_back_to_table_rows_and_encoded_sets_carry_table_rows()
    {
        var table = Table();
        var data = PreparedData.Prepare(table, new PrepareOptions { SampleRows = 60, SplitSeed = 5 });
        Assert.InRange(data.Count, 58, 62);
        Assert.True(data.Rows.Zip(data.Rows.Skip(1)).All(p => p.First < p.Second), "rows in play are ascending table rows");
        var fold = data.Fold();
        for (int p = 0; p < data.Count; p++)
        {
            Assert.Equal(table.Texts[data.TableRow(p)], data.Text(p));
            Assert.Equal(data.Labels[table.Labels[data.Rows[p]]], data.LabelIds[p]);
            Assert.Equal(data.Tokenizer.Split(data.Text(p)).Count, data.Lengths[p]);
        }
        Assert.Equal(data.TableRows(fold.Split.Test), fold.Test.SourceRows);
        Assert.Equal(fold.Split.Test.Select(p => data.LabelIds[p]), fold.Test.Labels);
        Assert.Equal(data.Count, fold.Split.Train.Length + fold.Split.Validation.Length + fold.Split.Test.Length);
        Assert.Same(fold, data.Fold(1));
    }

    [Fact]
    public void Group_split_keeps_groups_whole_and_the_vocabulary_comes_from_training_rows_only()
    {
        var data = PreparedData.Prepare(Table(), new PrepareOptions { SplitSeed = 3 });
        var fold = data.Fold();
        Assert.StartsWith("group holdout 0.7/0.15/0.15, seed 3", data.SplitDescription);
        Assert.Equal(0, fold.Leakage[LeakFinding.GroupAcrossParts].Rows);
        var trainTokens = fold.Split.Train.SelectMany(p => data.Pieces[p]).ToHashSet();
        Assert.Equal(trainTokens.Count + 2, fold.Vocabulary.Count);   // pad and unknown reserved
        // A digit that occurs only outside training is unknown to the vocabulary.
        foreach (var token in fold.Split.Test.SelectMany(p => data.Pieces[p]).Where(t => !trainTokens.Contains(t)))
            Assert.Equal(Vocabulary.UnknownId, fold.Vocabulary.Id(token));
        Assert.Equal(0, fold.Coverage[0].UnknownTokens);
        Assert.Equal(data.Labels.Names, fold.Summary.ClassNames);
    }

    [Fact]
    public void A_split_column_is_used_as_given_and_k_folds_tile_the_rows()
    {
        var given = PreparedData.Prepare(Table(withSplit: true), new PrepareOptions());
        Assert.Equal("given by the split column", given.SplitDescription);
        Assert.Equal(Enumerable.Range(0, 120).Where(i => i % 10 >= 8), given.Fold().Split.Test);

        var folds = PreparedData.Prepare(Table(), new PrepareOptions { Folds = 4, GroupAware = false, SplitSeed = 9 });
        Assert.Equal(4, folds.FoldCount);
        Assert.Equal(Enumerable.Range(0, 120), Enumerable.Range(1, 4).SelectMany(f => folds.Fold(f).Split.Test).Order());
        Assert.All(Enumerable.Range(1, 4), f => Assert.Empty(folds.Fold(f).Split.Test.Intersect(folds.Fold(f).Split.Train)));
        Assert.Throws<ArgumentOutOfRangeException>(() => folds.Fold(5));
        Assert.Throws<ArgumentException>(() => PreparedData.Prepare(Table(withSplit: true), new PrepareOptions { Folds = 3 }));
    }

    [Fact]
    public void The_same_options_give_the_same_preparation_and_bad_options_say_what_is_wrong()
    {
        var a = PreparedData.Prepare(Table(), new PrepareOptions { SampleRows = 50, SplitSeed = 11 });
        var b = PreparedData.Prepare(Table(), new PrepareOptions { SampleRows = 50, SplitSeed = 11 });
        Assert.Equal(a.Rows, b.Rows);
        Assert.Equal(a.Fold().Split.Test, b.Fold().Split.Test);
        var e = Assert.Throws<ArgumentException>(() => PreparedData.Prepare(Table(), new PrepareOptions { TrainFraction = 0.5, ValidationFraction = 0.1, TestFraction = 0.1 }));
        Assert.Contains("add up to 1", e.Message);
        Assert.Throws<ArgumentException>(() => PreparedData.Prepare(Table(), new PrepareOptions { MaxLength = 0 }));
    }
}
