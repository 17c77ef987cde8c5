using Kit.Data;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>The model bundle of a run: its model with everything needed to score new text (tokenizer, vocabulary, labels, temperature).</summary>
public static class RunBundle
{
    /// <param name="temperature">The temperature fitted on validation (from the run's diagnostics), or null.</param>
    public static ModelBundle Of(RunOutcome run, double? temperature) => new()
    {
        Model = run.Model,
        Tokenizer = TokenizerSpec.Of(run.Tokenizer),
        Vocabulary = run.Vocabulary,
        Labels = run.Labels,
        MaxLength = run.Data.Options.MaxLength,
        Truncation = run.Data.Options.Truncation,
        Temperature = temperature,
        TrainingSeed = run.Spec.Training.Seed,
    };
}
