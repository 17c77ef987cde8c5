using System.Globalization;
using System.Text;
using Kit.Diagnostics;

namespace Kit.Views;

/// <summary>
/// Occlusion attribution drawn on the text itself: each token's background shows how much the target class's
/// log-odds fell when that token was replaced by the unknown token (blue = it supported the class, brick = it
/// argued against it; stronger colour = larger change). Log-odds rather than probability, because a confident
/// call (p near 1) hardly moves its probability whatever is hidden, while its log-odds still do.
/// </summary>
public static class OcclusionViews
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>One explained test row: its text with each token's effect, and why it was picked.</summary>
    public static TextView Case(Kit.Experiments.OcclusionCase c) =>
        Tokens(c.Result, c.Pieces, c.TargetClass, $"Occlusion: why “{Shorten(c.Text, 40)}” was called {c.PredictedClass}", c.Unknown,
            $"Picked as {c.Why}. True class {c.TrueClass}, predicted {c.PredictedClass}. Each token was replaced in turn by the unknown token.");

    static string Shorten(string s, int n) => s.Length <= n ? s : s[..(n - 1)] + "…";

    /// <summary>How the colours and the "log-odds drop" column are measured, said once under every occlusion view.</summary>
    public const string Measure =
        "Measured in log-odds, log p − log(1 − p) (natural log; p clamped to [1e-15, 1 − 1e-15]): a drop of 1 means hiding the token divided the odds of the class by e ≈ 2.7. " +
        "Near p = 1 the probability barely moves (0.9999 → 0.999 is a drop of 0.0009) while the log-odds fall by 2.3, so confident calls still show what carried them.";

    /// <param name="pieces">What each position held, as text (one per position).</param>
    /// <param name="unknown">Positions whose token was not in the vocabulary (drawn underlined), or null.</param>
    public static TextView Tokens(OcclusionResult r, IReadOnlyList<string> pieces, string targetClass, string? heading = null,
        IReadOnlyList<bool>? unknown = null, string? note = null)
    {
        if (pieces.Count != r.Positions.Count)
            throw new ArgumentException($"{pieces.Count} pieces for {r.Positions.Count} occluded positions; give one per position.", nameof(pieces));
        double scale = r.Positions.Select(p => Math.Abs(p.LogOddsDrop)).Where(double.IsFinite).DefaultIfEmpty(0).Max();
        var sb = new StringBuilder();
        if (note is not null) sb.Append("<p>").Append(Html.Escape(note)).Append("</p>");
        sb.Append("<p class=\"kit-occlusion\">");
        for (int i = 0; i < pieces.Count; i++)
        {
            var p = r.Positions[i];
            string tip = string.Create(Inv, $"position {i}: p({targetClass}) {r.BaseProbability:F4} → {p.OccludedProbability:F4} when hidden; log-odds {r.BaseLogOdds:F2} → {p.OccludedLogOdds:F2} (change {-p.LogOddsDrop:+0.00;-0.00;0})");
            string cls = unknown is not null && i < unknown.Count && unknown[i] ? "kit-token kit-unknown" : "kit-token";
            sb.Append($"<span class=\"{cls}\" style=\"background:{Colour(p.LogOddsDrop, scale)}\" title=\"{Html.Escape(tip)}\">")
              .Append(Html.Escape(ProjectionViews.Visible(pieces[i]))).Append("</span>");
        }
        sb.Append("</p>");
        sb.Append("<p class=\"kit-legend\"><span class=\"kit-token\" style=\"background:").Append(Colour(scale, scale)).Append("\">supports</span> ")
          .Append("<span class=\"kit-token\" style=\"background:").Append(Colour(-scale, scale)).Append("\">argues against</span> ")
          .Append(Html.Escape(string.Create(Inv, $"the class {targetClass}; the strongest colour is a change of {scale:F2} in log-odds (base p = {r.BaseProbability:F4}, log-odds {r.BaseLogOdds:F2}). {Measure}")))
          .Append(unknown is not null && unknown.Any(u => u) ? " Underlined tokens were unknown to the vocabulary." : "").Append("</p>");
        var top = r.Positions.OrderByDescending(p => Math.Abs(p.LogOddsDrop)).ThenBy(p => p.Position).Take(5).ToArray();
        sb.Append(Html.Table(new[] { "position", "token", $"p({targetClass}) when hidden", "drop in p", "log-odds drop" },
            top.Select(p => (IReadOnlyList<string>)new[]
            {
                p.Position.ToString(Inv), ProjectionViews.Visible(pieces[p.Position]), Html.Num(p.OccludedProbability, 4), Html.Num(p.Drop, 4), Html.Num(p.LogOddsDrop, 2),
            }), "Positions that matter most (by log-odds drop)", textColumns: new[] { 1 }));
        return new TextView(heading ?? $"Occlusion for class {targetClass}", sb.ToString());
    }

    /// <summary>Blue for a positive drop, brick for a negative one, alpha by |drop| relative to the largest.</summary>
    internal static string Colour(double drop, double scale)
    {
        double a = scale <= 0 || !double.IsFinite(drop) ? 0 : Math.Min(1, Math.Abs(drop) / scale) * 0.6;
        string rgb = drop >= 0 ? "46,94,140" : "168,68,58";
        return string.Create(Inv, $"rgba({rgb},{a:F3})");
    }
}
