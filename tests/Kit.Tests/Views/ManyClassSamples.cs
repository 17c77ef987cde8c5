using Kit.Common;
using Kit.Data;
using Kit.Diagnostics;
using Kit.Training;

namespace Kit.Tests.Views;

/// <summary>
/// Synthetic predictions for 45 invented classes (seeded; not a reference): nine hidden groups of five classes,
/// where the model mixes classes up inside their group and hardly across groups. Groups are c mod 9, so in class
/// order their members are scattered; class sizes are long-tailed so the length histogram has small classes to fold.
/// One class name is hostile markup and some are long, for the margins.
/// </summary>
internal sealed class ManyClassSamples
{
    public const int Classes = 45, Groups = 9;
    static readonly string[] First = { "coolant", "bearing", "valve", "sensor", "relay", "pump", "filter", "gasket", "belt" };
    static readonly string[] Second = { "wear", "leak", "drift", "noise", "fault" };

    public string[] Names { get; }
    public int[] Labels { get; }
    public double[][] Probabilities { get; }
    public string[] Texts { get; }
    public ClassificationMetrics Metrics { get; }

    public static int GroupOf(int c) => c % Groups;

    public ManyClassSamples(ulong seed = 29)
    {
        Names = Enumerable.Range(0, Classes).Select(c => $"{First[c % 9]}-{Second[c / 9]}{(c % 11 == 3 ? "-intermittent-under-load" : "")}").ToArray();
        Names[44] = ViewSamples.Hostile;
        var rng = new SplitMix64(seed);
        var labels = new List<int>();
        for (int c = 0; c < Classes; c++)
            for (int r = 0; r < 8 + 400 / (1 + c); r++) labels.Add(c);
        Labels = labels.ToArray();
        Probabilities = new double[Labels.Length][];
        Texts = new string[Labels.Length];
        for (int i = 0; i < Labels.Length; i++)
        {
            int y = Labels[i];
            var z = Enumerable.Range(0, Classes).Select(c => 0.6 * rng.NextGaussian() + (c == y ? 3.2 : GroupOf(c) == GroupOf(y) ? 2.0 : 0)).ToArray();
            Probabilities[i] = TemperatureScaling.Apply([z], 1)[0];
            Texts[i] = $"unit{i:D4}-" + new string((char)('a' + y % 26), 2 + (i * 7 + y) % (4 + y % 13));
        }
        Metrics = ClassificationMetrics.Compute(Labels, Probabilities, Names);
    }

    public CalibrationReport Calibration() => CalibrationReport.Compute(Labels, Probabilities, Names, 10, BinningScheme.EqualWidth, bootstrap: 0);

    public DatasetProfile Profile() =>
        DatasetProfile.Compute(new LabelledTable("many-classes.csv", Texts, Labels.Select(l => Names[l]).ToArray(), null), new CharacterTokenizer());
}
