using System.Text;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>Rows to read by hand: mistakes made with the most confidence, the costliest rows, and the class pairs mixed up most often.</summary>
public static class ErrorViews
{
    public static TextView Tables(ErrorAnalysis e, string split = "test")
    {
        var sb = new StringBuilder();
        sb.Append($"<p>{Html.Count(e.Mistakes)} of {Html.Count(e.Count)} {Html.Escape(split)} rows are predicted wrongly ({Html.Pct(e.Count == 0 ? double.NaN : (double)e.Mistakes / e.Count)}).</p>");
        sb.Append(Examples(e.SureMistakes, $"Wrong and sure — mistakes made with the highest confidence (top {e.SureMistakes.Count})"));
        sb.Append(Examples(e.CostliestRows, $"Costliest rows — the largest losses, right or wrong; they pull the log loss up (top {e.CostliestRows.Count})"));
        sb.Append(Html.Table(new[] { "true class", "predicted as", "rows", "share of the true class", "surest examples" },
            e.MixedUpPairs.Select(p => (IReadOnlyList<string>)new[]
            {
                p.TrueClass, p.PredictedClass, Html.Count(p.Count), Html.Pct(p.ShareOfTrueClass), string.Join("  ·  ", p.Examples.Select(x => x.Text)),
            }), "Class pairs mixed up most often", textColumns: new[] { 0, 1, 4 }));
        return new TextView("Error analysis", sb.ToString());
    }

    static string Examples(IReadOnlyList<ErrorExample> rows, string caption) =>
        Html.Table(new[] { "#", "text", "true class", "predicted", "confidence", "p(true class)", "loss (nats)" },
            rows.Select(r => (IReadOnlyList<string>)new[]
            {
                r.Index.ToString(System.Globalization.CultureInfo.InvariantCulture), r.Text, r.TrueClass, r.PredictedClass,
                Html.Num(r.Confidence), Html.Num(r.TrueClassProbability), Html.Num(r.Loss, 2),
            }), caption, textColumns: new[] { 1, 2, 3 });
}
