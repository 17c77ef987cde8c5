using System.Globalization;
using System.Text.Json.Nodes;

namespace Kit.Views;

/// <summary>How an axis of rates reads: as percentages (85.2 %) or as plain fractions (0.852).</summary>
public enum RateFormat { Percent, Fraction }

/// <summary>
/// Ticks for an axis of rates (accuracy, probability, share), chosen from the data's range: a step of 1, 2 or
/// 5 × 10^k giving four to seven ticks that cover the data, and labels with just enough decimals that no two
/// read the same. plotly's own "%" format with a fixed number of decimals rounds 85.5 % and 86 % alike on a
/// narrow range, so the scale reads wrong; these ticks are written out instead.
/// </summary>
public sealed record AxisTicks(double Low, double High, double Step, IReadOnlyList<double> Values, IReadOnlyList<string> Labels)
{
    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// Ticks covering [<paramref name="dataLow"/>, <paramref name="dataHigh"/>] (rates in [0, 1]; NaN and infinite
    /// values are ignored by the callers' range helpers, not here). The first and last tick lie at or outside the
    /// data, never beyond 0 and 1 unless the data do.
    /// </summary>
    public static AxisTicks For(double dataLow, double dataHigh, RateFormat format = RateFormat.Percent)
    {
        if (!double.IsFinite(dataLow) || !double.IsFinite(dataHigh))
            throw new ArgumentException($"axis range [{dataLow}, {dataHigh}] is not finite");
        if (dataHigh < dataLow) (dataLow, dataHigh) = (dataHigh, dataLow);
        double span = dataHigh - dataLow;
        if (span < 1e-9)
        {
            // One value: show a small window around it (a tenth of a percentage point each side at least).
            double half = Math.Max(Math.Abs(dataLow) * 0.01, 0.001);
            // Kept inside [0, 1] when the value is, so a rate of exactly 0 or 1 gets no ticks beyond the possible.
            bool rate = dataLow >= 0 && dataLow <= 1;
            dataLow -= half;
            dataHigh += half;
            if (rate && dataLow < 0) (dataLow, dataHigh) = (0, dataHigh - dataLow);
            if (rate && dataHigh > 1) (dataLow, dataHigh) = (dataLow - (dataHigh - 1), 1);
            span = dataHigh - dataLow;
        }
        double step = NiceStep(dataLow, dataHigh, span);
        long first = (long)Math.Floor(dataLow / step + 1e-9), last = (long)Math.Ceiling(dataHigh / step - 1e-9);
        var values = new List<double>();
        for (long k = first; k <= last; k++) values.Add(Math.Round(k * step, 12));
        var labels = Label(values, step, format);
        return new AxisTicks(values[0], values[^1], step, values, labels);
    }

    /// <summary>Ticks for the finite values among <paramref name="values"/>; [0, 1] when there are none.</summary>
    public static AxisTicks ForValues(IEnumerable<double> values, RateFormat format = RateFormat.Percent)
    {
        var v = values.Where(double.IsFinite).ToArray();
        return v.Length == 0 ? For(0, 1, format) : For(v.Min(), v.Max(), format);
    }

    /// <summary>
    /// Writes the ticks into a plotly axis: fixed tick values and labels, and a range a little wider than the
    /// outer ticks (<paramref name="pad"/> of the span each side) so markers on the edge ticks are drawn whole.
    /// </summary>
    public JsonObject ApplyTo(JsonObject axis, double pad = 0.03)
    {
        axis.Remove("tickformat");
        axis["tickmode"] = "array";
        axis["tickvals"] = new JsonArray(Values.Select(v => (JsonNode)JsonValue.Create(v)).ToArray());
        axis["ticktext"] = new JsonArray(Labels.Select(l => (JsonNode)JsonValue.Create(l)).ToArray());
        double span = High - Low;
        axis["range"] = new JsonArray(Low - pad * span, High + pad * span);
        axis["autorange"] = false;
        return axis;
    }

    /// <summary>
    /// Ticks for a log axis of counts (parameters) over [10^<paramref name="logLow"/>, 10^<paramref name="logHigh"/>]:
    /// whole decades, or 1, 2 and 5 × 10^k, or every 1–9 × 10^k, whichever is the first to give three ticks; each
    /// written out whole with k, M or G ("20k"). plotly's own log ticks repeat the mantissas ("2, 3, … 10k, 2, 3")
    /// once the axis spans more than a decade. The range is set to exactly what is given.
    /// </summary>
    public static JsonObject ApplyLogCounts(JsonObject axis, double logLow, double logHigh)
    {
        List<double> Ticks(int[] mantissas)
        {
            var values = new List<double>();
            for (int k = (int)Math.Floor(logLow); k <= (int)Math.Ceiling(logHigh); k++)
                foreach (int m in mantissas)
                {
                    double v = m * Math.Pow(10, k), at = Math.Log10(v);
                    if (at >= logLow - 1e-9 && at <= logHigh + 1e-9 && v >= 1) values.Add(Math.Round(v));
                }
            return values;
        }
        // The coarsest set that gives three ticks; under a third of a decade, even steps as on a linear axis.
        var values = new[] { new[] { 1 }, [1, 2, 5], [1, 2, 3, 4, 5, 6, 7, 8, 9] }.Select(Ticks).FirstOrDefault(v => v.Count >= 3)
            ?? For(Math.Pow(10, logLow), Math.Pow(10, logHigh), RateFormat.Fraction).Values
                .Where(v => v >= Math.Pow(10, logLow) * (1 - 1e-9) && v <= Math.Pow(10, logHigh) * (1 + 1e-9)).ToList();
        axis.Remove("tickformat");
        axis["tickmode"] = "array";
        axis["tickvals"] = new JsonArray(values.Select(v => (JsonNode)JsonValue.Create(v)).ToArray());
        axis["ticktext"] = new JsonArray(values.Select(v => (JsonNode)JsonValue.Create(Compact(v))).ToArray());
        axis["range"] = new JsonArray(logLow, logHigh);
        return axis;
    }

    /// <summary>A whole count in at most three digits and a suffix: 500, 2k, 30k, 1M.</summary>
    internal static string Compact(double v) =>
        v >= 1e9 ? (v / 1e9).ToString("0.##", Inv) + "G" : v >= 1e6 ? (v / 1e6).ToString("0.##", Inv) + "M"
        : v >= 1e3 ? (v / 1e3).ToString("0.##", Inv) + "k" : v.ToString("0", Inv);

    /// <summary>The same ticks on a colour bar, whose range is the trace's zmin/zmax rather than the bar's own.</summary>
    public JsonObject ApplyToColourBar(JsonObject colourBar)
    {
        colourBar.Remove("tickformat");
        colourBar["tickmode"] = "array";
        colourBar["tickvals"] = new JsonArray(Values.Select(v => (JsonNode)JsonValue.Create(v)).ToArray());
        colourBar["ticktext"] = new JsonArray(Labels.Select(l => (JsonNode)JsonValue.Create(l)).ToArray());
        return colourBar;
    }

    /// <summary>The largest 1/2/5 step that still gives at least four ticks; at most seven is then guaranteed.</summary>
    static double NiceStep(double low, double high, double span)
    {
        // Start one decade above the span and walk down 5, 2, 1, 0.5, … until four ticks fit.
        double decade = Math.Pow(10, Math.Ceiling(Math.Log10(span)));
        foreach (double scale in Enumerable.Range(0, 12).SelectMany(i => new[] { 5.0, 2.0, 1.0 }.Select(m => m * decade * Math.Pow(10, -i - 1))))
        {
            long first = (long)Math.Floor(low / scale + 1e-9), last = (long)Math.Ceiling(high / scale - 1e-9);
            if (last - first + 1 >= 4) return scale;
        }
        return span / 4;
    }

    /// <summary>Fewest decimals that show the step, raised until every label is distinct.</summary>
    static IReadOnlyList<string> Label(IReadOnlyList<double> values, double step, RateFormat format)
    {
        double unit = format == RateFormat.Percent ? 100 : 1;
        int decimals = Math.Max(0, (int)Math.Ceiling(-Math.Log10(step * unit) - 1e-9));
        for (; ; decimals++)
        {
            var labels = values.Select(v => Format(v * unit, decimals, format)).ToArray();
            if (labels.Distinct(StringComparer.Ordinal).Count() == labels.Length || decimals >= 12) return labels;
        }
    }

    static string Format(double v, int decimals, RateFormat format)
    {
        string number = Math.Round(v, decimals).ToString("F" + decimals.ToString(Inv), Inv);
        if (number.StartsWith('-') && number.Trim('-', '0', '.').Length == 0) number = number[1..]; // no "-0.0"
        return format == RateFormat.Percent ? number + "%" : number;
    }
}
