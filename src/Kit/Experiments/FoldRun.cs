using System.Diagnostics;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Models;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// A run on a split chosen by the caller (a k-fold fold, or a holdout shared by every config of a sweep):
/// vocabulary from the training part only → model → training → test-part predictions. Same steps as
/// <see cref="SingleRun"/> after its split.
/// </summary>
public static class FoldRun
{
    /// <param name="rows">Table rows in play (a sample, or all); the split's indices are positions in this array.</param>
    /// <param name="clock">Started by a caller that wants its own earlier steps (reading, splitting) in Elapsed.</param>
    public static RunOutcome Execute(RunSpec spec, LabelledTable table, int[] rows, Split split,
        IProgress<TrainingProgress>? progress = null, CancellationToken cancel = default, Stopwatch? clock = null)
    {
        clock ??= Stopwatch.StartNew();
        var labels = new LabelMap(table.Labels);
        int[] y = rows.Select(r => labels[table.Labels[r]]).ToArray();
        var tokenizer = spec.CreateTokenizer();
        var texts = rows.Select(r => table.Texts[r]).ToArray();
        var vocab = Vocabulary.Build(split.Train.Select(i => tokenizer.Split(texts[i])), spec.MinTokenCount);
        var (all, truncation) = Encoder.Encode(texts, y, tokenizer, vocab, spec.MaxLength, spec.Truncation);
        var encoded = new EncodedSet(all.Tokens, all.Offsets, all.Labels, rows);
        var train = encoded.Subset(split.Train);
        var validation = encoded.Subset(split.Validation);
        var test = encoded.Subset(split.Test);

        Kit.Native.Engine.EnsureLoaded();
        var config = spec.ModelConfig(vocab.Count, labels.Count);
        TorchSharp.torch.manual_seed((long)(spec.Training.Seed & 0x7FFF_FFFF_FFFF_FFFF));
        var model = config.Build();
        var history = Trainer.Fit(model, train, validation.Count > 0 ? validation : null, spec.Training, progress, cancel);

        var valLogits = Scoring.Logits(model, validation);
        var testLogits = Scoring.Logits(model, test);
        var testProbs = Scoring.Softmax(testLogits);
        return new RunOutcome
        {
            Spec = spec, Table = table, Rows = rows, Split = split, Labels = labels, Tokenizer = tokenizer, Vocabulary = vocab,
            Config = config, Model = model, History = history, Validation = validation, Test = test,
            ValidationLogits = valLogits, TestLogits = testLogits, TestProbabilities = testProbs,
            TestMetrics = ClassificationMetrics.Compute(test.Labels, testProbs, labels.Names),
            Truncation = truncation, Elapsed = clock.Elapsed,
        };
    }
}
