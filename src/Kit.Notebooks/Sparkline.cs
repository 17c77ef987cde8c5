using System.Globalization;
using System.Text;
using Kit.Views;

namespace Kit.Notebooks;

/// <summary>A tiny inline SVG line chart: no axes, no script, so it redraws cheaply on every progress update.</summary>
public static class Sparkline
{
    /// <summary>
    /// Draws each series scaled to its own range (loss and a metric live on different scales). Points are
    /// (x, y) with x in [0, 1] as the share of training done. Non-finite values are skipped, not drawn as zero.
    /// </summary>
    public static string Svg(IReadOnlyList<(IReadOnlyList<(double X, double Y)> Points, string Colour)> series, int width = 240, int height = 48)
    {
        const double pad = 3;
        var sb = new StringBuilder();
        sb.Append(CultureInfo.InvariantCulture, $"<svg class=\"kit-spark\" width=\"{width}\" height=\"{height}\" viewBox=\"0 0 {width} {height}\" xmlns=\"http://www.w3.org/2000/svg\">");
        sb.Append(CultureInfo.InvariantCulture, $"<rect x=\"0\" y=\"0\" width=\"{width}\" height=\"{height}\" fill=\"#FFFFFF\" stroke=\"{Theme.Grid}\"/>");
        foreach (var (points, colour) in series)
        {
            var finite = points.Where(p => double.IsFinite(p.X) && double.IsFinite(p.Y)).ToList();
            if (finite.Count == 0) continue;
            double lo = finite.Min(p => p.Y), hi = finite.Max(p => p.Y);
            double span = hi - lo;
            sb.Append(CultureInfo.InvariantCulture, $"<polyline fill=\"none\" stroke=\"{colour}\" stroke-width=\"1.5\" points=\"");
            foreach (var (x, y) in finite)
            {
                double px = pad + Math.Clamp(x, 0, 1) * (width - 2 * pad);
                // A flat series sits in the middle rather than on an edge.
                double ny = span > 0 ? (y - lo) / span : 0.5;
                double py = height - pad - ny * (height - 2 * pad);
                sb.Append(px.ToString("F1", CultureInfo.InvariantCulture)).Append(',')
                  .Append(py.ToString("F1", CultureInfo.InvariantCulture)).Append(' ');
            }
            sb.Append("\"/>");
        }
        return sb.Append("</svg>").ToString();
    }
}
