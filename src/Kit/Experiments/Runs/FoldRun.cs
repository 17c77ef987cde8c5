using System.Diagnostics;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// One fold of prepared data (a k-fold fold, or the holdout shared by every config of a sweep): model → training
/// → validation and test logits. The fold's vocabulary and encoded parts come from <see cref="PreparedData"/>.
/// </summary>
public static class FoldRun
{
    /// <param name="clock">Started by a caller that wants its own earlier steps (reading, preparing) in Elapsed.</param>
    public static RunOutcome Execute(RunSpec spec, PreparedData data, int fold = 1,
        IProgress<TrainingProgress>? progress = null, CancellationToken cancel = default, Stopwatch? clock = null)
    {
        clock ??= Stopwatch.StartNew();
        var part = data.Fold(fold);

        Kit.Native.Engine.EnsureLoaded();
        var config = spec.ModelConfig(part.Vocabulary.Count, data.Labels.Count);
        TorchSharp.torch.manual_seed((long)(spec.Training.Seed & 0x7FFF_FFFF_FFFF_FFFF));
        var model = config.Build();
        var history = Trainer.Fit(model, part.Train, part.Validation.Count > 0 ? part.Validation : null, spec.Training, progress, cancel);

        var valLogits = Scoring.Logits(model, part.Validation);
        var testLogits = Scoring.Logits(model, part.Test);
        var testProbs = Scoring.Softmax(testLogits);
        return new RunOutcome
        {
            Spec = spec, Data = data, Fold = part, Config = config, Model = model, History = history,
            ValidationLogits = valLogits, TestLogits = testLogits, TestProbabilities = testProbs,
            TestMetrics = ClassificationMetrics.Compute(part.Test.Labels, testProbs, data.Labels.Names),
            Elapsed = clock.Elapsed,
        };
    }
}
