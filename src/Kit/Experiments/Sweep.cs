using System.Diagnostics;
using System.Globalization;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// A sweep made ready to run: the table read once, the sample drawn, the splits cut (one holdout, or k folds
/// with a validation share carved from each fold's training part), token counts and length-bin edges fixed.
/// Everything here is a function of the plan and the data, so any process that prepares the same plan cuts the
/// same splits, and a run gives the same record wherever it executes.
/// </summary>
public sealed class Sweep
{
    readonly int[] _labels;
    readonly IReadOnlyList<string>[] _tokens;
    readonly int[] _lengths;

    public SweepPlan Plan { get; }
    public LabelledTable Table { get; }
    /// <summary>Table rows in play; splits index positions in this array.</summary>
    public int[] Rows { get; }
    public LabelMap Labels { get; }
    /// <summary>Fold f's split is Splits[f − 1]; a holdout sweep has one.</summary>
    public IReadOnlyList<Split> Splits { get; }
    public double[] LengthEdges { get; }

    Sweep(SweepPlan plan, LabelledTable table)
    {
        Plan = plan.Validate();
        Table = table;
        var spec = plan.Base;
        Labels = new LabelMap(table.Labels);
        Rows = spec.SampleRows is int n && n < table.Count
            ? SingleRun.StratifiedSample(table.Labels.Select(l => Labels[l]).ToArray(), n, spec.SplitSeed)
            : Enumerable.Range(0, table.Count).ToArray();
        _labels = Rows.Select(r => Labels[table.Labels[r]]).ToArray();
        string[]? groups = spec.GroupAware && table.Groups is not null ? Rows.Select(r => table.Groups[r]).ToArray() : null;
        if (plan.Folds is int k)
        {
            // The validation share of each fold's training part matches the holdout's train : validation ratio.
            double validation = spec.ValidationFraction / (spec.TrainFraction + spec.ValidationFraction);
            Splits = groups is not null
                ? Splitter.GroupKFold(_labels, groups, k, spec.SplitSeed, validation)
                : Splitter.StratifiedKFold(_labels, k, spec.SplitSeed, validation);
        }
        else
        {
            Splits = [groups is not null
                ? Splitter.GroupHoldout(_labels, groups, spec.TrainFraction, spec.ValidationFraction, spec.TestFraction, spec.SplitSeed)
                : Splitter.StratifiedHoldout(_labels, spec.TrainFraction, spec.ValidationFraction, spec.TestFraction, spec.SplitSeed)];
        }
        var tokenizer = spec.CreateTokenizer();
        _tokens = Rows.Select(r => tokenizer.Split(table.Texts[r])).ToArray();
        _lengths = _tokens.Select(t => t.Count).ToArray();
        var edges = Kit.Diagnostics.LengthBins.Quantiles(plan.LengthBins).EdgesFor(_lengths.Select(l => (double)l).ToArray());
        LengthEdges = edges[^1] > edges[0] ? edges : [edges[0], edges[0] + 1];
    }

    public static Sweep Prepare(SweepPlan plan, LabelledTable? table = null) =>
        new(plan, table ?? TableReader.Read(plan.Base.DataPath, plan.Base.Columns));

    /// <summary>Runs one config × seed × fold and scores it on that fold's test part.</summary>
    public RunRecord Execute(RunKey key, IProgress<TrainingProgress>? progress = null, CancellationToken cancel = default)
    {
        if (key.Folds != Splits.Count || key.Fold < 1 || key.Fold > Splits.Count)
            throw new ArgumentException($"run {key.Id} does not fit this sweep ({Splits.Count} fold(s))");
        var config = Plan.ConfigNamed(key.Config);
        var split = Splits[key.Fold - 1];
        var clock = Stopwatch.StartNew();
        var inv = CultureInfo.InvariantCulture;
        if (config.IsBaseline)
        {
            var baseline = NgramBaseline.Fit(config.BaselineKind, split.Train.Select(p => _tokens[p]).ToArray(), split.Train.Select(p => _labels[p]).ToArray(),
                Labels.Count, Plan.BaselineNgrams, Plan.NaiveBayesSmoothing, Plan.LinearL2);
            double trainSeconds = clock.Elapsed.TotalSeconds;
            var probs = baseline.Probabilities(split.Test.Select(p => _tokens[p]).ToArray());
            return Score(key, config, baseline.Description, split, probs, baseline.ParameterCount, [], 0, new RunTiming(trainSeconds, clock.Elapsed.TotalSeconds, 1));
        }
        var spec = config.Apply(Plan.Base);
        spec = spec with { Training = spec.Training with { Seed = key.Seed } };
        var run = FoldRun.Execute(spec, Table, Rows, split, progress, cancel);
        var epochs = run.History.Epochs.Select(e => new EpochPoint(e.Epoch, e.TrainLoss, e.TrainAccuracy, e.ValidationLoss, e.ValidationAccuracy)).ToArray();
        string description = string.Create(inv,
            $"{Kit.Models.ModelDescription.Of(run.Config)}, {spec.Training.Epochs} epochs, batch {spec.Training.BatchSize}, lr {spec.Training.LearningRate}");
        var timing = new RunTiming(run.History.Epochs.Sum(e => e.Seconds), clock.Elapsed.TotalSeconds,
            spec.Training.Threads > 0 ? spec.Training.Threads : Environment.ProcessorCount);
        return Score(key, config, description, split, run.TestProbabilities, run.Model.ParameterCount(), epochs, run.History.BestEpoch, timing);
    }

    RunRecord Score(RunKey key, SweepConfig config, string model, Split split, double[][] probabilities, long parameters,
        IReadOnlyList<EpochPoint> epochs, int bestEpoch, RunTiming timing)
    {
        var names = Labels.Names;
        int[] y = split.Test.Select(p => _labels[p]).ToArray();
        var metrics = ClassificationMetrics.Compute(y, probabilities, names);
        var calibration = CalibrationReport.Compute(y, probabilities, names, Plan.CalibrationBins, bootstrap: 0);
        var byLength = LengthBreakdown.Compute(y, metrics.Predicted, split.Test.Select(p => _lengths[p]).ToArray(), names,
            Kit.Diagnostics.LengthBins.Edges(LengthEdges));
        return new RunRecord
        {
            Id = key.Id, Config = config.Name, Settings = config.Settings, Baseline = config.IsBaseline, Model = model,
            Seed = key.Seed, Fold = key.Fold, Folds = key.Folds, Parameters = parameters,
            Accuracy = metrics.Accuracy, MacroF1 = metrics.MacroF1, BalancedAccuracy = metrics.BalancedAccuracy,
            LogLoss = metrics.LogLoss, Brier = metrics.Brier, Ece = calibration.Ece, Mce = calibration.Mce, ClasswiseEce = calibration.ClasswiseEce,
            Reliability = RunRecord.ReliabilityOf(calibration), ByLength = RunRecord.LengthsOf(byLength),
            Epochs = epochs, BestEpoch = bestEpoch, ClassNames = names.ToArray(),
            TestRows = split.Test.Select(p => Rows[p]).ToArray(), TestLabels = y, Predicted = metrics.Predicted, Timing = timing,
        };
    }
}
