using Kit.Data;

namespace Kit.Experiments;

/// <summary>One n-gram baseline fitted beside a run: where its file went and its accuracy on the run's test part.</summary>
public sealed record BaselineFile(BaselineKind Kind, string Path, double TestAccuracy, string Description);

/// <summary>
/// Fits both n-gram baselines on a run's training part (same split, same tokenizer) and saves each as a file that
/// `kit score` reads, so a trained model always has its baselines beside it.
/// </summary>
public static class BaselineFiles
{
    public static string FileName(BaselineKind kind) => kind == BaselineKind.LogisticRegression ? "logistic-regression.kitngram" : "naive-bayes.kitngram";

    public static IReadOnlyList<BaselineFile> Write(RunOutcome run, string directory,
        double smoothing = NgramBaseline.DefaultSmoothing, double l2 = NgramBaseline.DefaultL2)
    {
        Directory.CreateDirectory(directory);
        // The prepared data already holds every position's tokens and label id.
        IReadOnlyList<string> Tokens(int position) => run.Data.Pieces[position];
        int Label(int position) => run.Data.LabelIds[position];
        var train = run.Split.Train.Select(Tokens).ToArray();
        var labels = run.Split.Train.Select(Label).ToArray();
        var test = run.Split.Test.Select(Tokens).ToArray();
        var truth = run.Split.Test.Select(Label).ToArray();
        var scheme = NgramScheme.ForTokenizer(run.Data.Options.Tokenizer);
        var written = new List<BaselineFile>();
        foreach (var kind in new[] { BaselineKind.NaiveBayes, BaselineKind.LogisticRegression })
        {
            var baseline = NgramBaseline.Fit(kind, train, labels, run.Labels.Count, scheme, smoothing, l2);
            var p = baseline.Probabilities(test);
            double accuracy = truth.Length == 0 ? double.NaN : truth.Where((y, i) => Array.IndexOf(p[i], p[i].Max()) == y).Count() / (double)truth.Length;
            string path = System.IO.Path.Combine(directory, FileName(kind));
            new NgramModelFile { Baseline = baseline, Tokenizer = TokenizerSpec.Of(run.Tokenizer), Labels = run.Labels }.Save(path);
            written.Add(new BaselineFile(kind, path, accuracy, baseline.Description));
        }
        return written;
    }
}
