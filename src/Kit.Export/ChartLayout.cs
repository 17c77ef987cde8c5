using System.Globalization;

namespace Kit.Export;

/// <summary>A rectangle on the rendered page, in CSS pixels (left, top, right, bottom).</summary>
internal readonly record struct TextBox(double Left, double Top, double Right, double Bottom)
{
    public double Width => Right - Left;
    public double Height => Bottom - Top;

    /// <summary>True when this box lies inside <paramref name="frame"/>, allowing <paramref name="slack"/> pixels.</summary>
    public bool Inside(TextBox frame, double slack = 1) =>
        Left >= frame.Left - slack && Top >= frame.Top - slack && Right <= frame.Right + slack && Bottom <= frame.Bottom + slack;

    public override string ToString() => string.Create(CultureInfo.InvariantCulture, $"[{Left:F0},{Top:F0} – {Right:F0},{Bottom:F0}]");
}

/// <summary>
/// The four corners of a piece of text as drawn (page pixels, in drawing order), so rotated tick labels are judged by
/// the area their glyph line covers, not by the much larger upright box around it.
/// </summary>
internal readonly record struct TextQuad(double X1, double Y1, double X2, double Y2, double X3, double Y3, double X4, double Y4)
{
    public static TextQuad Of(TextBox b) => new(b.Left, b.Top, b.Right, b.Top, b.Right, b.Bottom, b.Left, b.Bottom);

    (double X, double Y)[] Corners => [(X1, Y1), (X2, Y2), (X3, Y3), (X4, Y4)];

    public TextBox Bounds
    {
        get
        {
            var c = Corners;
            return new TextBox(c.Min(p => p.X), c.Min(p => p.Y), c.Max(p => p.X), c.Max(p => p.Y));
        }
    }

    /// <summary>
    /// True when the two quads overlap by more than <paramref name="depth"/> pixels along every separating direction
    /// (separating-axis test for convex polygons; the edge normals of both quads are the candidate axes). Text boxes
    /// include the line's ascent and descent, so a pixel of slack keeps touching lines of text apart.
    /// </summary>
    public bool Overlaps(TextQuad other, double depth = 1)
    {
        foreach (var quad in new[] { this, other })
        {
            var c = quad.Corners;
            for (int i = 0; i < 4; i++)
            {
                var (ax, ay) = c[i];
                var (bx, by) = c[(i + 1) % 4];
                double nx = -(by - ay), ny = bx - ax, length = Math.Sqrt(nx * nx + ny * ny);
                if (length < 1e-9) continue;
                nx /= length; ny /= length;
                var (minA, maxA) = Project(Corners, nx, ny);
                var (minB, maxB) = Project(other.Corners, nx, ny);
                if (Math.Min(maxA, maxB) - Math.Max(minA, minB) <= depth) return false;
            }
        }
        return true;
    }

    static (double Min, double Max) Project((double X, double Y)[] corners, double nx, double ny)
    {
        double min = double.PositiveInfinity, max = double.NegativeInfinity;
        foreach (var (x, y) in corners)
        {
            double d = x * nx + y * ny;
            min = Math.Min(min, d);
            max = Math.Max(max, d);
        }
        return (min, max);
    }
}

/// <summary>
/// One piece of text a chart drew: a tick label (<see cref="Group"/> = its axis), a title, an annotation (which
/// carries small-multiple titles), the legend, a point's name on a scatter, or a number printed in a heatmap cell; with its font size in pixels.
/// </summary>
internal sealed record ChartText(string Kind, string Group, string Text, TextQuad Quad, double FontPixels)
{
    public ChartText(string kind, string group, string text, TextBox box, double fontPixels = 12) : this(kind, group, text, TextQuad.Of(box), fontPixels) { }

    public TextBox Box => Quad.Bounds;
}

/// <summary>
/// The text of one rendered chart as the browser laid it out, and the chart's own drawing area.
/// <see cref="Problems"/> lists what a reader would trip over.
/// </summary>
internal sealed record ChartLayout(int Index, string Name, TextBox Frame, IReadOnlyList<ChartText> Ticks, IReadOnlyList<ChartText> Labels)
{
    /// <summary>
    /// Smallest text a printed or pasted chart stays readable at, in CSS pixels (common practice, no source: 8 px is
    /// about 6 pt, below which body text is generally considered unreadable on paper).
    /// </summary>
    public const double MinimumFontPixels = 8;

    /// <summary>
    /// What is wrong with the layout, in plain words (empty when nothing is): two tick labels on one axis that read the
    /// same (the scale then reads wrong); tick labels of one axis drawn over each other; two titles, annotations or the
    /// legend drawn over each other or over tick labels; heatmap numbers drawn over each other; text smaller than
    /// <see cref="MinimumFontPixels"/>; and any text drawn partly outside the chart's area (cut off on screen and in
    /// pasted images). The same text drawn twice in the same place (plotly repeats shared axis titles) counts once.
    /// </summary>
    public IReadOnlyList<string> Problems()
    {
        var problems = new List<string>();
        var ticks = Distinct(Ticks);
        var labels = Distinct(Labels);
        foreach (var axis in ticks.GroupBy(t => t.Group))
        {
            var onAxis = axis.ToArray();
            foreach (var same in onAxis.GroupBy(t => t.Text).Where(g => g.Count() > 1))
                problems.Add($"chart {Index} '{Name}': axis {axis.Key} shows the tick label '{same.Key}' {same.Count()} times ({string.Join(", ", onAxis.Select(t => t.Text))})");
            int crowded = Pairs(onAxis).Count(p => p.A.Quad.Overlaps(p.B.Quad));
            if (crowded > 0)
                problems.Add($"chart {Index} '{Name}': axis {axis.Key} draws tick labels over each other ({crowded} overlapping pairs of {onAxis.Length} labels)");
        }
        var cells = labels.Where(l => l.Kind == "cell label").ToArray();
        int piled = Pairs(cells).Count(p => p.A.Quad.Overlaps(p.B.Quad));
        if (piled > 0) problems.Add($"chart {Index} '{Name}': {piled} pairs of cell numbers drawn over each other ({cells.Length} numbers)");
        var headings = labels.Where(l => l.Kind != "cell label").ToArray();
        foreach (var (a, b) in Pairs(headings).Where(p => p.A.Quad.Overlaps(p.B.Quad)))
            problems.Add($"chart {Index} '{Name}': {a.Kind} '{Short(a.Text)}' {a.Box} overlaps {b.Kind} '{Short(b.Text)}' {b.Box}");
        foreach (var h in headings)
        {
            var under = ticks.Where(t => t.Quad.Overlaps(h.Quad)).ToArray();
            if (under.Length > 0)
                problems.Add($"chart {Index} '{Name}': {h.Kind} '{Short(h.Text)}' {h.Box} is drawn over {under.Length} tick label(s) of axis {under[0].Group} ('{Short(under[0].Text)}')");
        }
        var small = ticks.Concat(labels).Where(t => t.FontPixels < MinimumFontPixels - 1e-9).ToArray();
        if (small.Length > 0)
            problems.Add(string.Create(CultureInfo.InvariantCulture,
                $"chart {Index} '{Name}': {small.Length} texts smaller than {MinimumFontPixels} px (smallest {small.Min(t => t.FontPixels):F1} px, e.g. {small[0].Kind} '{Short(small[0].Text)}')"));
        foreach (var t in ticks.Concat(labels))
            if (!t.Box.Inside(Frame))
                problems.Add($"chart {Index} '{Name}': {t.Kind} '{Short(t.Text)}' {t.Box} is cut off by the chart's edge {Frame}");
        return problems;
    }

    static ChartText[] Distinct(IEnumerable<ChartText> texts) =>
        texts.GroupBy(t => (t.Kind, t.Text, Round(t.Box))).Select(g => g.First()).ToArray();

    static (long, long, long, long) Round(TextBox b) => ((long)Math.Round(b.Left), (long)Math.Round(b.Top), (long)Math.Round(b.Right), (long)Math.Round(b.Bottom));

    static IEnumerable<(ChartText A, ChartText B)> Pairs(IReadOnlyList<ChartText> items)
    {
        for (int i = 0; i < items.Count; i++)
            for (int j = i + 1; j < items.Count; j++)
                yield return (items[i], items[j]);
    }

    static string Short(string s) => s.Length <= 40 ? s : s[..39] + "…";

    /// <summary>
    /// The script that reads every chart's text from a page the kit's views drew (plotly.js SVG): each text's corners
    /// from its own box through its screen transform (so rotation counts), and its font size on screen.
    /// </summary>
    internal const string Script = """
        () => JSON.stringify(Array.from(document.querySelectorAll('[data-kit-chart]')).map((chart, index) => {
          const quad = e => {
            const b = e.getBBox(), m = e.getScreenCTM();
            return [[b.x, b.y], [b.x + b.width, b.y], [b.x + b.width, b.y + b.height], [b.x, b.y + b.height]]
              .flatMap(([x, y]) => [m.a * x + m.c * y + m.e + scrollX, m.b * x + m.d * y + m.f + scrollY]);
          };
          const px = e => { const m = e.getScreenCTM(); return parseFloat(getComputedStyle(e).fontSize) * Math.hypot(m.a, m.b); };
          const frameOf = e => { const b = e.getBoundingClientRect(); return [b.left + scrollX, b.top + scrollY, b.right + scrollX, b.bottom + scrollY]; };
          const shown = e => { const b = e.getBoundingClientRect(); return b.width > 0 && b.height > 0 && e.textContent.trim() !== '' && getComputedStyle(e).opacity !== '0' && getComputedStyle(e).visibility !== 'hidden'; };
          const svg = chart.querySelector('svg.main-svg');
          const ticks = [], labels = [];
          chart.querySelectorAll('text').forEach(t => {
            if (!shown(t)) return;
            const parent = t.parentElement, cls = (parent.getAttribute('class') || '').split(' ')[0], own = (t.getAttribute('class') || '').split(' ')[0];
            const item = (kind, group) => ({ kind, group, text: t.textContent, quad: quad(t), font: px(t) });
            if (parent.tagName === 'g' && /tick$/.test(cls)) ticks.push(item('tick label', cls));
            else if (cls === 'heatmap-label') labels.push(item('cell label', 'heatmap'));
            else if (cls === 'textpoint') labels.push(item('point label', 'points'));
            else if (/title$/.test(own)) labels.push(item(own === 'gtitle' ? 'chart title' : 'axis title', own));
          });
          chart.querySelectorAll('g.annotation').forEach(a => {
            const g = a.querySelector('g.annotation-text-g') || a, t = a.querySelector('text');
            if (a.textContent.trim() !== '' && g.getBoundingClientRect().width > 0)
              labels.push({ kind: 'annotation', group: 'annotation', text: a.textContent, quad: quad(g), font: t ? px(t) : 12 });
          });
          chart.querySelectorAll('g.legend').forEach(l => {
            const bg = l.querySelector('rect.bg') || l;
            if (bg.getBoundingClientRect().width > 0)
              labels.push({ kind: 'legend', group: 'legend', text: Array.from(l.querySelectorAll('text.legendtext')).map(t => t.textContent).join(' | '), quad: quad(bg), font: 12 });
          });
          return { index, name: chart.getAttribute('data-kit-name') || '', frame: frameOf(svg || chart), ticks, labels };
        }))
        """;
}
