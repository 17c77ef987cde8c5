namespace Kit.Training;

/// <summary>One evaluation pass: mean cross-entropy, accuracy and macro F1 (classes absent from both truth and predictions are left out of the mean).</summary>
public sealed record ValidationScores(double Loss, double Accuracy, double MacroF1)
{
    public double Get(MonitorMetric metric) => metric switch
    {
        MonitorMetric.ValidationLoss => Loss,
        MonitorMetric.ValidationAccuracy => Accuracy,
        MonitorMetric.ValidationMacroF1 => MacroF1,
        _ => throw new ArgumentOutOfRangeException(nameof(metric)),
    };

    public static bool HigherIsBetter(MonitorMetric metric) => metric != MonitorMetric.ValidationLoss;

    internal static double MacroF1From(long[] truePositive, long[] predicted, long[] actual)
    {
        double sum = 0;
        int classes = 0;
        for (int k = 0; k < truePositive.Length; k++)
        {
            if (predicted[k] + actual[k] == 0) continue;
            classes++;
            sum += 2.0 * truePositive[k] / (predicted[k] + actual[k]);
        }
        return classes == 0 ? double.NaN : sum / classes;
    }
}
