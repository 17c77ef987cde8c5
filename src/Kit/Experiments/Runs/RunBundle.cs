using Kit.Data;
using Kit.Training;

namespace Kit.Experiments;

/// <summary>
/// The model bundle of a run: its model with everything needed to score new text (tokenizer, vocabulary, labels,
/// temperature) and the training profile that score-time drift checks compare new rows with.
/// </summary>
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
        Profile = Profile(run, temperature),
    };

    /// <summary>Validation rows' token lengths (before truncation), unknown tokens and calibrated confidence; the training labels' prior.</summary>
    public static TrainingProfile Profile(RunOutcome run, double? temperature)
    {
        var validation = run.Validation;
        var rawLengths = run.Split.Validation.Select(p => run.Data.Lengths[p]).ToArray();
        long unknown = validation.Tokens.LongCount(id => id == Vocabulary.UnknownId);
        var probabilities = Scoring.Softmax(run.ValidationLogits, temperature ?? 1.0);
        var trainLabels = run.Split.Train.Select(p => run.Data.LabelIds[p]).ToArray();
        return TrainingProfile.From(run.Data.Options.MaxLength, rawLengths, validation.Tokens.LongLength, unknown, run.Labels.Names, trainLabels, probabilities);
    }
}
