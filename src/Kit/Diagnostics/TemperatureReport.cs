using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Temperature fitted on the validation split and its effect on the test split: ECE (equal-width bins) and NLL
/// before and after. Accuracy does not change — dividing logits by a positive T keeps their order — so it is
/// reported once.
/// </summary>
public sealed record TemperatureReport(double Temperature, bool AtSearchBound, double ValidationNllBefore, double ValidationNllAfter,
    double TestNllBefore, double TestNllAfter, double TestEceBefore, double TestEceAfter, double TestAccuracy, int Bins)
{
    public double T => Temperature;
    /// <summary>Test-split calibration before scaling (what the view compares against).</summary>
    public CalibrationReport? Before { get; init; }
    /// <summary>Test-split calibration after dividing the logits by <see cref="Temperature"/>.</summary>
    public CalibrationReport? After { get; init; }

    public static TemperatureReport Compute(double[][] validationLogits, int[] validationLabels, double[][] testLogits, int[] testLabels,
        IReadOnlyList<string> classNames, int bins = 15)
    {
        InputChecks.ClassNames(classNames);
        int kVal = TemperatureScaling.CheckLogits(validationLogits, validationLabels, nameof(validationLogits), nameof(validationLabels));
        int kTest = TemperatureScaling.CheckLogits(testLogits, testLabels, nameof(testLogits), nameof(testLabels));
        if (kVal != classNames.Count || kTest != classNames.Count)
            throw new ArgumentException(
                $"logits have {kVal} (validation) and {kTest} (test) columns but there are {classNames.Count} class names.", nameof(classNames));
        double t = TemperatureScaling.Fit(validationLogits, validationLabels);
        var before = CalibrationReport.Compute(testLabels, TemperatureScaling.Apply(testLogits, 1), classNames, bins, bootstrap: 0);
        var after = CalibrationReport.Compute(testLabels, TemperatureScaling.Apply(testLogits, t), classNames, bins, bootstrap: 0);
        int correct = 0;
        for (int i = 0; i < testLogits.Length; i++) if (InputChecks.ArgMax(testLogits[i]) == testLabels[i]) correct++;
        return new TemperatureReport(t, t <= TemperatureScaling.MinTemperature || t >= TemperatureScaling.MaxTemperature,
            TemperatureScaling.NegativeLogLikelihood(validationLogits, validationLabels, 1),
            TemperatureScaling.NegativeLogLikelihood(validationLogits, validationLabels, t),
            TemperatureScaling.NegativeLogLikelihood(testLogits, testLabels, 1),
            TemperatureScaling.NegativeLogLikelihood(testLogits, testLabels, t),
            before.Ece, after.Ece, (double)correct / testLogits.Length, bins) { Before = before, After = after };
    }

    /// <summary>Stage/Split/Metric/Value rows (before and after scaling).</summary>
    public DataFrame ToDataFrame()
    {
        var rows = new (string Stage, string Split, string Metric, double Value)[]
        {
            ("before", "validation", "NLL", ValidationNllBefore), ("after", "validation", "NLL", ValidationNllAfter),
            ("before", "test", "NLL", TestNllBefore), ("after", "test", "NLL", TestNllAfter),
            ("before", "test", "ECE", TestEceBefore), ("after", "test", "ECE", TestEceAfter),
            ("fitted", "validation", "Temperature", Temperature),
        };
        return new DataFrame(FrameColumns.Text("Stage", rows.Select(r => r.Stage)), FrameColumns.Text("Split", rows.Select(r => r.Split)),
            FrameColumns.Text("Metric", rows.Select(r => r.Metric)), FrameColumns.Number("Value", rows.Select(r => r.Value)));
    }
}
