using System.Globalization;

namespace Kit.Export;

/// <summary>A rectangle on the rendered page, in CSS pixels (left, top, right, bottom).</summary>
public readonly record struct TextBox(double Left, double Top, double Right, double Bottom)
{
    public double Width => Right - Left;
    public double Height => Bottom - Top;

    /// <summary>True when the two boxes share more than <paramref name="slack"/> pixels in both directions.</summary>
    public bool Intersects(TextBox o, double slack = 0.5) =>
        Math.Min(Right, o.Right) - Math.Max(Left, o.Left) > slack && Math.Min(Bottom, o.Bottom) - Math.Max(Top, o.Top) > slack;

    /// <summary>True when this box lies inside <paramref name="frame"/>, allowing <paramref name="slack"/> pixels.</summary>
    public bool Inside(TextBox frame, double slack = 1) =>
        Left >= frame.Left - slack && Top >= frame.Top - slack && Right <= frame.Right + slack && Bottom <= frame.Bottom + slack;

    public override string ToString() => string.Create(CultureInfo.InvariantCulture, $"[{Left:F0},{Top:F0} – {Right:F0},{Bottom:F0}]");
}

/// <summary>One piece of text a chart drew: a tick label (<see cref="Group"/> = its axis), a title or an annotation.</summary>
public sealed record ChartText(string Kind, string Group, string Text, TextBox Box);

/// <summary>
/// The text of one rendered chart as the browser laid it out: tick labels grouped by axis, titles (chart, axis and
/// colour-bar titles), annotations (which carry small-multiple titles) and the legend box, each with its on-screen
/// box, and the chart's own drawing area. <see cref="Problems"/> lists what a reader would trip over.
/// </summary>
public sealed record ChartLayout(int Index, string Name, TextBox Frame, IReadOnlyList<ChartText> Ticks, IReadOnlyList<ChartText> Labels)
{
    /// <summary>
    /// What is wrong with the layout, in plain words (empty when nothing is): two tick labels on one axis that read the
    /// same (the scale then reads wrong), two titles, annotations or the legend drawn over each other, and any text
    /// drawn partly outside the chart's area (cut off on screen and in pasted images).
    /// </summary>
    public IReadOnlyList<string> Problems()
    {
        var problems = new List<string>();
        foreach (var axis in Ticks.GroupBy(t => t.Group))
            foreach (var same in axis.GroupBy(t => t.Text).Where(g => g.Count() > 1))
                problems.Add($"chart {Index} '{Name}': axis {axis.Key} shows the tick label '{same.Key}' {same.Count()} times ({string.Join(", ", axis.Select(t => t.Text))})");
        for (int i = 0; i < Labels.Count; i++)
            for (int j = i + 1; j < Labels.Count; j++)
                if (Labels[i].Box.Intersects(Labels[j].Box))
                    problems.Add($"chart {Index} '{Name}': {Labels[i].Kind} '{Short(Labels[i].Text)}' {Labels[i].Box} overlaps {Labels[j].Kind} '{Short(Labels[j].Text)}' {Labels[j].Box}");
        foreach (var t in Ticks.Concat(Labels))
            if (!t.Box.Inside(Frame))
                problems.Add($"chart {Index} '{Name}': {t.Kind} '{Short(t.Text)}' {t.Box} is cut off by the chart's edge {Frame}");
        return problems;
    }

    static string Short(string s) => s.Length <= 40 ? s : s[..39] + "…";

    /// <summary>The script that reads every chart's text boxes from a page the kit's views drew (plotly.js SVG).</summary>
    internal const string Script = """
        () => JSON.stringify(Array.from(document.querySelectorAll('[data-kit-chart]')).map((chart, index) => {
          const box = e => { const b = e.getBoundingClientRect(); return [b.left + scrollX, b.top + scrollY, b.right + scrollX, b.bottom + scrollY]; };
          const svg = chart.querySelector('svg.main-svg');
          const shown = e => { const b = e.getBoundingClientRect(); return b.width > 0 && b.height > 0 && e.textContent.trim() !== '' && getComputedStyle(e).opacity !== '0'; };
          const ticks = [], labels = [];
          chart.querySelectorAll('text').forEach(t => {
            if (!shown(t)) return;
            const parent = t.parentElement, cls = (parent.getAttribute('class') || '').split(' ')[0], own = (t.getAttribute('class') || '').split(' ')[0];
            if (parent.tagName === 'g' && /tick$/.test(cls) && !/^(x|y)?(minor)/.test(cls)) ticks.push({ kind: 'tick label', group: cls, text: t.textContent, box: box(t) });
            else if (/title$/.test(own)) labels.push({ kind: own === 'gtitle' ? 'chart title' : 'axis title', group: own, text: t.textContent, box: box(t) });
          });
          chart.querySelectorAll('g.annotation').forEach(a => {
            const g = a.querySelector('g.annotation-text-g') || a;
            if (a.textContent.trim() !== '' && g.getBoundingClientRect().width > 0) labels.push({ kind: 'annotation', group: 'annotation', text: a.textContent, box: box(g) });
          });
          chart.querySelectorAll('g.legend').forEach(l => {
            const bg = l.querySelector('rect.bg') || l;
            if (bg.getBoundingClientRect().width > 0) labels.push({ kind: 'legend', group: 'legend', text: Array.from(l.querySelectorAll('text.legendtext')).map(t => t.textContent).join(' | '), box: box(bg) });
          });
          return { index, name: chart.getAttribute('data-kit-name') || '', frame: box(svg || chart), ticks, labels };
        }))
        """;
}
