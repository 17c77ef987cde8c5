using Kit.Experiments;
using Kit.Training;

namespace Kit.Cli;

/// <summary>The training profile of a finished run: validation rows' lengths, unknown tokens and calibrated confidence, training labels' prior.</summary>
internal static class TrainingProfileOfRun
{
    public static TrainingProfile Build(RunOutcome run, int maxLength, double? temperature)
    {
        var validation = run.Validation;
        var rawLengths = validation.SourceRows.Select(r => run.Tokenizer.Split(run.Table.Texts[r]).Count).ToArray();
        long unknown = validation.Tokens.LongCount(id => id == Kit.Data.Vocabulary.UnknownId);
        var probabilities = Kit.Training.Scoring.Softmax(run.ValidationLogits, temperature ?? 1.0);
        var trainLabels = run.Split.Train.Select(i => run.Labels[run.Table.Labels[run.Rows[i]]]).ToArray();
        return TrainingProfile.From(maxLength, rawLengths, validation.Tokens.LongLength, unknown, run.Labels.Names, trainLabels, probabilities);
    }
}
