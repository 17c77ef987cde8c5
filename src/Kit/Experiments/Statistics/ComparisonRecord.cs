using Microsoft.Data.Analysis;

namespace Kit.Experiments;

/// <summary>
/// The comparison of a sweep's configs: one summary per config (ordered by mean accuracy, best first) and paired
/// tests of the best config against every other on the same test items.
/// </summary>
public sealed record ComparisonRecord(IReadOnlyList<ConfigSummary> Configs, IReadOnlyList<PairedComparison> PairedTests,
    IReadOnlyList<string> ClassNames, int Runs, IReadOnlyList<string> Notes)
{
    public ConfigSummary Best => Configs[0];

    /// <summary>The rungs of the search this comparison came from (its configs are then the last rung's and the baselines); null for a grid sweep.</summary>
    public SearchRecord? Search { get; init; }

    /// <summary>The comparison in one paragraph: best config, how sure, and the cheapest config level with it.</summary>
    public ComparisonVerdict Verdict => ComparisonVerdict.Of(this);

    public static ComparisonRecord Build(IReadOnlyList<RunRecord> runs, IEnumerable<string>? notes = null)
    {
        if (runs.Count == 0) throw new ArgumentException("no finished runs to compare");
        var names = runs[0].ClassNames;
        if (runs.Any(r => !r.ClassNames.SequenceEqual(names))) throw new ArgumentException("runs disagree on the class names; they are not from one sweep");
        var noteList = notes?.ToList() ?? [];
        var byConfig = runs.GroupBy(r => r.Config).ToDictionary(g => g.Key, g => (IReadOnlyList<RunRecord>)g.ToArray());
        var summaries = byConfig.Values.Select(ConfigSummary.Of)
            .OrderByDescending(s => s.Accuracy.Mean).ThenBy(s => s.Config, StringComparer.Ordinal).ToArray();
        var labels = ConfigLabels.Of(summaries.Select(s => new ConfigLabels.Entry(s.Config, s.Settings, s.Baseline)).ToArray());
        summaries = summaries.Select(s => s with { Label = labels[s.Config] }).ToArray();
        var best = summaries[0].Config;
        var paired = summaries.Skip(1).SelectMany(s => PairedComparison.Compare(byConfig[best], byConfig[s.Config], noteList)).ToArray();
        return new ComparisonRecord(summaries, paired, names.ToArray(), runs.Count, noteList);
    }

    /// <summary>One row per config: mean, SD and 95 % interval of each metric, parameters, training time.</summary>
    public DataFrame ToDataFrame()
    {
        var c = Configs;
        var columns = new List<DataFrameColumn>
        {
            new StringDataFrameColumn("config", c.Select(x => x.Config)),
            new StringDataFrameColumn("label", c.Select(x => x.Label)),
            new Int32DataFrameColumn("runs", c.Select(x => x.Runs)),
        };
        foreach (var (name, pick) in new (string, Func<ConfigSummary, SummaryStatistic>)[]
                 { ("accuracy", x => x.Accuracy), ("macro_f1", x => x.MacroF1), ("ece", x => x.Ece), ("log_loss", x => x.LogLoss) })
        {
            columns.Add(new DoubleDataFrameColumn($"{name}_mean", c.Select(x => pick(x).Mean)));
            columns.Add(new DoubleDataFrameColumn($"{name}_sd", c.Select(x => pick(x).StandardDeviation)));
            columns.Add(new DoubleDataFrameColumn($"{name}_low", c.Select(x => pick(x).Low)));
            columns.Add(new DoubleDataFrameColumn($"{name}_high", c.Select(x => pick(x).High)));
        }
        columns.Add(new Int64DataFrameColumn("parameters", c.Select(x => x.Parameters)));
        columns.Add(new DoubleDataFrameColumn("train_seconds_mean", c.Select(x => x.TrainSeconds.Mean)));
        return new DataFrame(columns);
    }

    /// <summary>One row per paired test.</summary>
    public DataFrame PairedToDataFrame()
    {
        var p = PairedTests;
        return new DataFrame(
            new StringDataFrameColumn("a", p.Select(x => x.A)),
            new StringDataFrameColumn("b", p.Select(x => x.B)),
            new UInt64DataFrameColumn("seed", p.Select(x => x.Seed)),
            new Int32DataFrameColumn("items", p.Select(x => x.Items)),
            new Int32DataFrameColumn("only_a_right", p.Select(x => x.McNemar.OnlyA)),
            new Int32DataFrameColumn("only_b_right", p.Select(x => x.McNemar.OnlyB)),
            new StringDataFrameColumn("method", p.Select(x => x.McNemar.Method.ToString())),
            new DoubleDataFrameColumn("statistic", p.Select(x => x.McNemar.Statistic)),
            new DoubleDataFrameColumn("p_value", p.Select(x => x.McNemar.PValue)),
            new DoubleDataFrameColumn("accuracy_difference", p.Select(x => x.Bootstrap.Difference)),
            new DoubleDataFrameColumn("difference_low", p.Select(x => x.Bootstrap.Low)),
            new DoubleDataFrameColumn("difference_high", p.Select(x => x.Bootstrap.High)));
    }

    /// <summary>By-length accuracy in long form: one row per config × length bin (items pooled over runs).</summary>
    public DataFrame ByLengthToDataFrame()
    {
        var rows = Configs.SelectMany(c => c.ByLength.Select(b => (c.Config, b))).ToArray();
        return new DataFrame(
            new StringDataFrameColumn("config", rows.Select(r => r.Config)),
            new StringDataFrameColumn("bin", rows.Select(r => r.b.Bin)),
            new Int32DataFrameColumn("count", rows.Select(r => r.b.Count)),
            new Int32DataFrameColumn("correct", rows.Select(r => r.b.Correct)),
            new DoubleDataFrameColumn("accuracy", rows.Select(r => r.b.Accuracy)),
            new DoubleDataFrameColumn("wilson_low", rows.Select(r => r.b.WilsonLow)),
            new DoubleDataFrameColumn("wilson_high", rows.Select(r => r.b.WilsonHigh)));
    }

    /// <summary>Mean learning curves in long form: one row per config × epoch.</summary>
    public DataFrame CurvesToDataFrame()
    {
        var rows = Configs.SelectMany(c => c.Curve.Select(p => (c.Config, p))).ToArray();
        return new DataFrame(
            new StringDataFrameColumn("config", rows.Select(r => r.Config)),
            new Int32DataFrameColumn("epoch", rows.Select(r => r.p.Epoch)),
            new Int32DataFrameColumn("runs", rows.Select(r => r.p.Runs)),
            new DoubleDataFrameColumn("train_loss", rows.Select(r => r.p.TrainLoss)),
            new DoubleDataFrameColumn("validation_loss", rows.Select(r => r.p.ValidationLoss)),
            new DoubleDataFrameColumn("validation_accuracy", rows.Select(r => r.p.ValidationAccuracy)));
    }
}
