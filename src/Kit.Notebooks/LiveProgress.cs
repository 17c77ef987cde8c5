using System.Globalization;
using System.Text;
using Kit.Views;
using Microsoft.DotNet.Interactive;
using Microsoft.DotNet.Interactive.Formatting;
using Html = Kit.Views.Html;

namespace Kit.Notebooks;

/// <summary>Entry points for <see cref="LiveProgress{T}"/>, so a cell reads <c>var live = LiveProgress.Start();</c>.</summary>
public static class LiveProgress
{
    public static LiveProgress<ProgressSnapshot> Start(string title = "Training", TimeProvider? time = null) =>
        new(s => s, title, time);

    /// <summary>For a training layer with its own progress record: map it to a snapshot once, here.</summary>
    public static LiveProgress<T> Start<T>(Func<T, ProgressSnapshot> map, string title = "Training", TimeProvider? time = null) =>
        new(map, title, time);

    /// <summary>The display for the kit's own training loop (<see cref="Kit.Training.Trainer"/>, <c>SingleRun</c>).</summary>
    public static LiveProgress<Kit.Training.TrainingProgress> ForTraining(string title = "Training", TimeProvider? time = null) =>
        new(FromTraining, title, time);

    public static ProgressSnapshot FromTraining(Kit.Training.TrainingProgress p) =>
        new(p.Epoch, p.Epochs, p.Batch, p.Batches, p.Loss, p.ValidationAccuracy, p.Eta, "validation accuracy");
}

/// <summary>
/// One notebook output that redraws in place while a model trains: epoch, batch, loss, validation metric, time
/// left and a small curve. Reports arrive on the training thread; drawing is throttled so a fast loop does not
/// flood the front end, but the first report, every new epoch and the final one are always drawn.
/// Outside a kernel (a console run) it writes one plain line per epoch instead.
/// </summary>
public sealed class LiveProgress<T> : IProgress<T>
{
    const int MaxPoints = 400;

    readonly Func<T, ProgressSnapshot> _map;
    readonly TimeProvider _time;
    readonly long _started;
    readonly object _gate = new();
    readonly List<(double X, double Y)> _loss = new();
    readonly List<(double X, double Y)> _metric = new();
    DisplayedValue? _displayed;
    TimeSpan _lastDrawn = TimeSpan.MinValue;
    int _lastEpochDrawn = -1;

    public string Title { get; }
    public TimeSpan MinInterval { get; init; } = TimeSpan.FromMilliseconds(250);
    public ProgressSnapshot? Last { get; private set; }
    public int Draws { get; private set; }
    public IReadOnlyList<(double X, double Y)> LossHistory { get { lock (_gate) return _loss.ToList(); } }

    public LiveProgress(Func<T, ProgressSnapshot> map, string title = "Training", TimeProvider? time = null)
    {
        _map = map ?? throw new ArgumentNullException(nameof(map));
        _time = time ?? TimeProvider.System;
        _started = _time.GetTimestamp();
        Title = title;
    }

    public TimeSpan Elapsed => _time.GetElapsedTime(_started);

    public void Report(T value)
    {
        var s = _map(value);
        lock (_gate)
        {
            Last = s;
            Record(_loss, (s.Fraction, s.Loss));
            if (s.ValidationMetric is { } m && (_metric.Count == 0 || _metric[^1].X != s.Fraction))
                Record(_metric, (s.Fraction, m));

            TimeSpan now = Elapsed;
            bool due = Draws == 0 || s.Epoch != _lastEpochDrawn || s.IsFinal || now - _lastDrawn >= MinInterval;
            if (!due) return;
            _lastDrawn = now;
            bool newEpoch = s.Epoch != _lastEpochDrawn;
            _lastEpochDrawn = s.Epoch;
            Draw(s, newEpoch);
        }
    }

    /// <summary>Draws the latest state even if the throttle would skip it (call after a loop that stops early).</summary>
    public void Flush()
    {
        lock (_gate)
            if (Last is { } s) Draw(s, newEpoch: true);
    }

    void Draw(ProgressSnapshot s, bool newEpoch)
    {
        Draws++;
        var context = KernelInvocationContext.Current;
        if (context is null)
        {
            if (newEpoch || s.IsFinal) Console.WriteLine(PlainLine(s));
            return;
        }
        var html = Kernel.HTML(ToHtml());
        if (_displayed is null) _displayed = context.Display(html, HtmlFormatter.MimeType);
        else _displayed.Update(html);
    }

    static void Record(List<(double X, double Y)> series, (double X, double Y) point)
    {
        series.Add(point);
        if (series.Count <= MaxPoints) return;
        // Halve the resolution of the older part rather than dropping the start: the curve keeps its shape.
        var kept = series.Where((_, i) => i % 2 == 0 || i == series.Count - 1).ToList();
        series.Clear();
        series.AddRange(kept);
    }

    /// <summary>Time left: the snapshot's own estimate if it has one, else elapsed time scaled by the share left.</summary>
    public TimeSpan? EstimatedRemaining(ProgressSnapshot s)
    {
        if (s.Eta is { } eta) return eta;
        double f = s.Fraction;
        if (f <= 0) return null;
        return TimeSpan.FromSeconds(Elapsed.TotalSeconds * (1 - f) / f);
    }

    public string PlainLine(ProgressSnapshot s)
    {
        var eta = EstimatedRemaining(s);
        return $"{Title}: epoch {s.Epoch}/{s.Epochs} batch {s.Batch}/{s.Batches} loss {Html.Num(s.Loss, 4)}" +
               (s.ValidationMetric is { } m ? $" {s.MetricName} {Html.Num(m, 4)}" : "") +
               (eta is { } e ? $" left {Duration(e)}" : "");
    }

    public string ToHtml()
    {
        lock (_gate)
        {
            var s = Last;
            var sb = new StringBuilder();
            sb.Append(CultureInfo.InvariantCulture,
                $"<div class=\"kit-live\" style=\"font-family:{Theme.FontStack};color:{Theme.Ink};border-left:4px solid {Theme.Palette[0]};padding:6px 10px;max-width:560px\">");
            sb.Append("<div><strong>").Append(Html.Escape(Title)).Append("</strong>");
            if (s is null)
            {
                sb.Append(" · waiting for the first batch</div></div>");
                return sb.ToString();
            }
            sb.Append(CultureInfo.InvariantCulture, $" · epoch <span data-kit-epoch=\"{s.Epoch}\">{s.Epoch}/{s.Epochs}</span>");
            if (s.Batches > 0) sb.Append(CultureInfo.InvariantCulture, $" · batch {s.Batch}/{s.Batches}");
            sb.Append(s.IsFinal ? " · done" : "").Append("</div>");

            double pct = 100 * s.Fraction;
            sb.Append(CultureInfo.InvariantCulture,
                $"<div style=\"background:{Theme.Grid};height:6px;margin:4px 0\"><div style=\"background:{Theme.Palette[0]};height:6px;width:{pct:F1}%\"></div></div>");

            var eta = EstimatedRemaining(s);
            sb.Append("<div style=\"font-variant-numeric:tabular-nums\">")
              .Append("<span style=\"color:").Append(Theme.Palette[0]).Append("\">loss ").Append(Html.Num(s.Loss, 4)).Append("</span>");
            if (s.ValidationMetric is { } m)
                sb.Append(" · <span style=\"color:").Append(Theme.Palette[1]).Append("\">").Append(Html.Escape(s.MetricName))
                  .Append(' ').Append(Html.Num(m, 4)).Append("</span>");
            sb.Append(" · elapsed ").Append(Duration(Elapsed));
            if (!s.IsFinal && eta is { } e) sb.Append(" · left ").Append(Duration(e));
            sb.Append("</div>");

            sb.Append(Sparkline.Svg(new (IReadOnlyList<(double, double)>, string)[] { (_loss, Theme.Palette[0]), (_metric, Theme.Palette[1]) }));
            return sb.Append("</div>").ToString();
        }
    }

    internal static string Duration(TimeSpan t)
    {
        if (t < TimeSpan.Zero) t = TimeSpan.Zero;
        if (t.TotalSeconds < 60) return $"{t.TotalSeconds.ToString("F0", CultureInfo.InvariantCulture)} s";
        if (t.TotalMinutes < 60) return $"{(int)t.TotalMinutes} min {t.Seconds} s";
        return $"{(int)t.TotalHours} h {t.Minutes} min";
    }
}
