namespace Kit.Views;

/// <summary>
/// Where to write each point's name on a scatter so no two names, and no name and another point, overlap: a greedy
/// pass in the given order (the first points get the first choice) over eight places around the point, keeping the
/// name inside the plot. Coordinates are pixels from the plot's top-left corner; sizes are estimates
/// (<see cref="TextWidth"/>), so a margin of a few pixels is kept around every name.
/// </summary>
public static class LabelPlacement
{
    /// <summary>plotly.js text positions, in the order they are tried.</summary>
    public static readonly IReadOnlyList<string> Positions =
        ["top center", "bottom center", "middle right", "middle left", "top right", "top left", "bottom right", "bottom left"];

    const double Marker = 6, Gap = 3;

    readonly record struct Box(double Left, double Top, double Right, double Bottom)
    {
        public bool Overlaps(Box o) => Left < o.Right && o.Left < Right && Top < o.Bottom && o.Top < Bottom;
    }

    /// <summary>
    /// For each point (x, y; NaN = not drawn) with a name <paramref name="widths"/>[i] pixels wide and
    /// <paramref name="height"/> tall, the position to write it at, or null when every place collides.
    /// </summary>
    public static string?[] Place(IReadOnlyList<(double X, double Y)> points, IReadOnlyList<double> widths, double height, double plotWidth, double plotHeight)
    {
        var markers = points.Select(p => new Box(p.X - Marker, p.Y - Marker, p.X + Marker, p.Y + Marker)).ToArray();
        var labels = new List<Box>();
        var result = new string?[points.Count];
        for (int i = 0; i < points.Count; i++)
        {
            var (x, y) = points[i];
            if (!double.IsFinite(x) || !double.IsFinite(y)) continue;
            foreach (var position in Positions)
            {
                var box = LabelBox(position, x, y, widths[i] + 2 * Gap, height + Gap);
                bool inside = box.Left >= 0 && box.Right <= plotWidth && box.Top >= 0 && box.Bottom <= plotHeight;
                bool onPoint = Enumerable.Range(0, points.Count).Any(j => j != i && double.IsFinite(points[j].X) && double.IsFinite(points[j].Y) && markers[j].Overlaps(box));
                if (!inside || onPoint || labels.Any(l => l.Overlaps(box))) continue;
                labels.Add(box);
                result[i] = position;
                break;
            }
        }
        return result;
    }

    static Box LabelBox(string position, double x, double y, double w, double h)
    {
        var (vertical, horizontal) = (position.Split(' ')[0], position.Split(' ')[1]);
        double left = horizontal switch { "center" => x - w / 2, "right" => x + Marker, _ => x - Marker - w };
        double topEdge = vertical switch { "top" => y - Marker - h, "bottom" => y + Marker, _ => y - h / 2 };
        return new Box(left, topEdge, left + w, topEdge + h);
    }
}
