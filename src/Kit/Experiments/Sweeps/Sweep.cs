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
    public SweepPlan Plan { get; }
    /// <summary>The sweep's data, prepared once: every config, seed and fold trains on it.</summary>
    public PreparedData Data { get; }
    public LabelledTable Table => Data.Table;
    /// <summary>Table rows in play; splits index positions in this array.</summary>
    public int[] Rows => Data.Rows;
    public LabelMap Labels => Data.Labels;
    /// <summary>Fold f's split is Splits[f − 1]; a holdout sweep has one.</summary>
    public IReadOnlyList<Split> Splits => Data.Splits;
    public double[] LengthEdges { get; }

    Sweep(SweepPlan plan, LabelledTable table)
    {
        Plan = plan.Validate();
        Data = PreparedData.Prepare(table, plan.Preparation);
        var edges = Kit.Diagnostics.LengthBins.Quantiles(plan.LengthBins).EdgesFor(Data.Lengths.Select(l => (double)l).ToArray());
        LengthEdges = edges[^1] > edges[0] ? edges : [edges[0], edges[0] + 1];
    }

    public static Sweep Prepare(SweepPlan plan, LabelledTable? table = null) =>
        new(plan, table ?? TableReader.Read(plan.Base.DataPath, plan.Base.Columns));

    /// <summary>Runs one config × seed × fold and scores it on that fold's test part.</summary>
    public RunRecord Execute(RunKey key, IProgress<TrainingProgress>? progress = null, CancellationToken cancel = default) =>
        Execute(key, Plan.ConfigNamed(key.Config), progress, cancel);

    /// <summary>
    /// Runs <paramref name="config"/> (which a search builds per rung, so it need not be one of the plan's configs);
    /// <paramref name="trained"/> sees a neural run's outcome before it is dropped (a search keeps its models).
    /// </summary>
    internal RunRecord Execute(RunKey key, SweepConfig config, IProgress<TrainingProgress>? progress = null, CancellationToken cancel = default,
        Action<RunOutcome>? trained = null)
    {
        if (key.Folds != Splits.Count || key.Fold < 1 || key.Fold > Splits.Count)
            throw new ArgumentException($"run {key.Id} does not fit this sweep ({Splits.Count} fold(s))");
        var split = Splits[key.Fold - 1];
        var tokens = Data.Pieces;
        var labels = Data.LabelIds;
        var clock = Stopwatch.StartNew();
        var inv = CultureInfo.InvariantCulture;
        if (config.IsBaseline)
        {
            var baseline = NgramBaseline.Fit(config.BaselineKind, split.Train.Select(p => tokens[p]).ToArray(), split.Train.Select(p => labels[p]).ToArray(),
                Labels.Count, Plan.BaselineNgrams, Plan.NaiveBayesSmoothing, Plan.LinearL2);
            double trainSeconds = clock.Elapsed.TotalSeconds;
            var probs = baseline.Probabilities(split.Test.Select(p => tokens[p]).ToArray());
            // Scored on the validation part too, so a search's final pick compares like with like.
            double? validation = split.Validation.Length == 0 ? null
                : AccuracyOf(baseline.Probabilities(split.Validation.Select(p => tokens[p]).ToArray()), split.Validation.Select(p => labels[p]).ToArray());
            return Score(key, config, baseline.Description, split, probs, baseline.ParameterCount, [], 0, new RunTiming(trainSeconds, clock.Elapsed.TotalSeconds, 1))
                with { ValidationAccuracy = validation };
        }
        var spec = config.Apply(Plan.Base);
        spec = spec with { Training = spec.Training with { Seed = key.Seed } };
        var run = FoldRun.Execute(spec, Data, key.Fold, progress, cancel);
        trained?.Invoke(run);
        var epochs = run.History.Epochs.Select(e => new EpochPoint(e.Epoch, e.TrainLoss, e.TrainAccuracy, e.ValidationLoss, e.ValidationAccuracy)).ToArray();
        string description = string.Create(inv,
            $"{Kit.Models.ModelDescription.Of(run.Config)}, {spec.Training.Epochs} epochs, batch {spec.Training.BatchSize}, lr {spec.Training.LearningRate}");
        var timing = new RunTiming(run.History.Epochs.Sum(e => e.Seconds), clock.Elapsed.TotalSeconds,
            spec.Training.Threads > 0 ? spec.Training.Threads : Environment.ProcessorCount);
        double? validationAccuracy = split.Validation.Length == 0 ? null : AccuracyOf(run.ValidationLogits, run.Fold.Validation.Labels);
        return Score(key, config, description, split, run.TestProbabilities, run.Model.ParameterCount(), epochs, run.History.BestEpoch, timing)
            with { ValidationAccuracy = validationAccuracy };
    }

    /// <summary>Share of rows whose highest score (probability or logit) is the true class; ties go to the lower class id.</summary>
    static double AccuracyOf(double[][] scores, int[] labels)
    {
        int hits = 0;
        for (int i = 0; i < labels.Length; i++)
        {
            int best = 0;
            for (int c = 1; c < scores[i].Length; c++) if (scores[i][c] > scores[i][best]) best = c;
            if (best == labels[i]) hits++;
        }
        return labels.Length == 0 ? double.NaN : (double)hits / labels.Length;
    }

    RunRecord Score(RunKey key, SweepConfig config, string model, Split split, double[][] probabilities, long parameters,
        IReadOnlyList<EpochPoint> epochs, int bestEpoch, RunTiming timing)
    {
        var names = Labels.Names;
        int[] y = split.Test.Select(p => Data.LabelIds[p]).ToArray();
        var metrics = ClassificationMetrics.Compute(y, probabilities, names);
        var calibration = CalibrationReport.Compute(y, probabilities, names, Plan.CalibrationBins, bootstrap: 0);
        var byLength = LengthBreakdown.Compute(y, metrics.Predicted, split.Test.Select(p => Data.Lengths[p]).ToArray(), names,
            Kit.Diagnostics.LengthBins.Edges(LengthEdges));
        return new RunRecord
        {
            Id = key.Id, Config = config.Name, Settings = config.Settings, Baseline = config.IsBaseline, Model = model,
            Seed = key.Seed, Fold = key.Fold, Folds = key.Folds, Parameters = parameters,
            Accuracy = metrics.Accuracy, MacroF1 = metrics.MacroF1, BalancedAccuracy = metrics.BalancedAccuracy,
            LogLoss = metrics.LogLoss, Brier = metrics.Brier, Ece = calibration.Ece, Mce = calibration.Mce, ClasswiseEce = calibration.ClasswiseEce,
            Reliability = RunRecord.ReliabilityOf(calibration), ByLength = RunRecord.LengthsOf(byLength),
            Epochs = epochs, BestEpoch = bestEpoch, ClassNames = names.ToArray(),
            TestRows = Data.TableRows(split.Test), TestLabels = y, Predicted = metrics.Predicted, Timing = timing,
        };
    }
}
