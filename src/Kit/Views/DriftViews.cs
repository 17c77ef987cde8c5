using System.Globalization;
using System.Text.Json.Nodes;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>The drift check: its verdicts as a table, and scored rows against the training profile, one panel per aspect.</summary>
public static class DriftViews
{
    public static StackView View(DriftReport report) =>
        new($"Drift check ({report.Rows} scored rows)", new IView[] { Verdicts(report), Distributions(report) });

    public static TextView Verdicts(DriftReport report)
    {
        var rows = report.Checks.Select(c => (IReadOnlyList<string>)new[]
        {
            c.Aspect, c.Statistic, c.Value.ToString("0.####", CultureInfo.InvariantCulture), c.Level.ToString().ToLowerInvariant(), c.Verdict,
        });
        string table = Html.Table(new[] { "aspect", "statistic", "value", "level", "verdict" }, rows,
            $"{report.Rows} scored rows against {report.ReferenceRows} validation rows of the training run", textColumns: new[] { 0, 1, 3, 4 });
        string note = "<p>Thresholds: PSI below 0.1 stable, 0.1–0.25 moderate, above 0.25 major; KS at p &lt; 0.01; unknown-token rate " +
                      "more than doubled (common practice, no source). A warning sign, not a guarantee: a model can be confidently wrong on rows that pass.</p>";
        return new TextView("Drift verdicts", table + note);
    }

    public static ChartView Distributions(DriftReport report)
    {
        var traces = new JsonArray();
        int n = report.Histograms.Count;
        for (int i = 0; i < n; i++)
        {
            var h = report.Histograms[i];
            string axis = i == 0 ? "" : (i + 1).ToString(CultureInfo.InvariantCulture);
            foreach (var (name, values, colour) in new[] { ("training (validation rows)", h.Reference, Theme.Colour(0)), ("scored rows", h.Scored, Theme.Colour(1)) })
                traces.Add(new JsonObject
                {
                    ["type"] = "bar", ["name"] = name, ["legendgroup"] = name, ["showlegend"] = i == 0,
                    ["x"] = Figure.Texts(h.Bins), ["y"] = Figure.Numbers(values), ["xaxis"] = "x" + axis, ["yaxis"] = "y" + axis,
                    ["marker"] = new JsonObject { ["color"] = colour },
                    ["hovertemplate"] = $"{h.Aspect} %{{x}}<br>{name}: %{{y:.1%}} of rows<extra></extra>",
                });
        }
        string worst = report.Worst switch { DriftLevel.Major => "major shift", DriftLevel.Moderate => "moderate shift", _ => "no shift flagged" };
        var layout = Theme.Layout($"Scored rows against training — {worst}", "", "share of rows", height: 360 + 120 * (n - 1));
        layout["barmode"] = "group";
        layout["grid"] = new JsonObject { ["rows"] = n, ["columns"] = 1, ["pattern"] = "independent", ["roworder"] = "top to bottom" };
        for (int i = 0; i < n; i++)
        {
            string axis = i == 0 ? "" : (i + 1).ToString(CultureInfo.InvariantCulture);
            var x = Theme.Axis(report.Histograms[i].Aspect);
            var y = Theme.Axis("share of rows");
            AxisTicks.ForValues(report.Histograms[i].Reference.Concat(report.Histograms[i].Scored).Append(0)).ApplyTo(y);
            layout["xaxis" + axis] = x;
            layout["yaxis" + axis] = y;
        }
        return new ChartView("Drift: scored rows against training", traces, layout)
        {
            Caption = "Each panel: share of rows per bin, training profile (validation rows) beside the scored rows. Tokens are counted before truncation.",
        };
    }
}
