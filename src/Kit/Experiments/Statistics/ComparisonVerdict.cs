using System.Globalization;
using Kit.Diagnostics;
using Microsoft.Data.Analysis;

namespace Kit.Experiments;

/// <summary>
/// The best config's lead over one other config, from the paired tests on the same test items: per training seed
/// (folds joined), the lead counts as established when McNemar's p is below 0.05 and the paired bootstrap 95 %
/// interval of accuracy(best) − accuracy(other) lies wholly above 0. Both are asked because they answer a little
/// differently (a test of the discordant counts, an interval on the difference); a lead that passes one only is
/// not called established.
/// </summary>
public sealed record LeadOver(string Config, string Label, bool Baseline, int Tested, int Established,
    double MeanDifference, double PValue, double Low, double High)
{
    /// <summary>The significance level of McNemar's test (common practice, no source).</summary>
    public const double Alpha = 0.05;

    /// <summary>True when no seed establishes a lead: the two configs are level on these test rows.</summary>
    public bool Level => Tested > 0 && Established == 0;

    public static LeadOver Of(ConfigSummary other, IReadOnlyList<PairedComparison> tests)
    {
        int established = tests.Count(t => t.McNemar.PValue < Alpha && t.Bootstrap.Low > 0);
        return new LeadOver(other.Config, other.Label, other.Baseline, tests.Count, established,
            tests.Count == 0 ? double.NaN : tests.Average(t => t.Bootstrap.Difference),
            tests.Count == 1 ? tests[0].McNemar.PValue : double.NaN,
            tests.Count == 1 ? tests[0].Bootstrap.Low : double.NaN,
            tests.Count == 1 ? tests[0].Bootstrap.High : double.NaN);
    }
}

/// <summary>
/// What a comparison says in one paragraph: the best config (by mean test accuracy, as the comparison orders them)
/// with its accuracy and 95 % interval, whether its lead over the runner-up and over each baseline is established
/// on these test rows, and the cheapest config (fewest parameters, then shortest training) that is level with it.
/// </summary>
public sealed record ComparisonVerdict(
    string BestConfig, string BestLabel, double Accuracy, double Low, double High, string IntervalKind,
    int Seeds, int Folds, LeadOver? RunnerUp, IReadOnlyList<LeadOver> Baselines,
    string? CheapestLevelConfig, string? CheapestLevelLabel, long BestParameters, long CheapestLevelParameters)
{
    /// <summary>
    /// For a budgeted search: the config it chose by validation accuracy (the model it wrote), and that config's label.
    /// It can differ from <see cref="BestConfig"/>, the best on the test rows; the search's choice is the one made
    /// without looking at them.
    /// </summary>
    public string? SearchChoice { get; init; }
    public string? SearchChoiceLabel { get; init; }

    static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static ComparisonVerdict Of(ComparisonRecord c)
    {
        var best = c.Best;
        var (low, high, kind) = Interval(best);
        LeadOver Lead(ConfigSummary other) => LeadOver.Of(other, c.PairedTests.Where(p => p.A == best.Config && p.B == other.Config).ToArray());
        var runnerUp = c.Configs.Count > 1 ? Lead(c.Configs[1]) : null;
        var baselines = c.Configs.Skip(1).Where(s => s.Baseline).Select(Lead).ToArray();
        // Candidates in order of cost; the best itself ends the search, since nothing after it is cheaper.
        ConfigSummary? cheapest = null;
        foreach (var s in c.Configs.OrderBy(s => s.Parameters).ThenBy(s => double.IsNaN(s.TrainSeconds.Mean) ? double.MaxValue : s.TrainSeconds.Mean))
        {
            if (s.Config == best.Config) break;
            if (Lead(s).Level) { cheapest = s; break; }
        }
        string? chosen = c.Search?.Choice?.Configs.FirstOrDefault();
        return new ComparisonVerdict(best.Config, best.Label, best.Accuracy.Mean, low, high, kind, best.Seeds, best.Folds, runnerUp, baselines,
            cheapest?.Config, cheapest?.Label, best.Parameters, cheapest?.Parameters ?? 0)
        {
            SearchChoice = chosen,
            SearchChoiceLabel = chosen is null ? null : c.Configs.FirstOrDefault(s => s.Config == chosen)?.Label ?? chosen,
        };
    }

    /// <summary>
    /// Over several runs, the t interval of the run accuracies; with one run, the Wilson interval of its test items
    /// (Wilson 1927), since there is no spread over runs to take.
    /// </summary>
    static (double Low, double High, string Kind) Interval(ConfigSummary best)
    {
        // A t interval over few runs can pass 0 or 100 %; accuracy cannot, so it is cut there.
        if (best.Accuracy.Count >= 2) return (Math.Max(0, best.Accuracy.Low), Math.Min(1, best.Accuracy.High), "t interval over runs");
        int n = best.ByLength.Sum(b => b.Count), hits = best.ByLength.Sum(b => b.Correct);
        if (n == 0) return (double.NaN, double.NaN, "");
        var (lo, hi) = Wilson.Interval(hits, n);
        return (lo, hi, $"Wilson interval on {n.ToString("N0", Inv)} test rows");
    }

    /// <summary>One row per config the best was tested against: how many seeds were tested and in how many the lead holds.</summary>
    public DataFrame ToDataFrame()
    {
        var leads = (RunnerUp is null ? Baselines : Baselines.Where(b => b.Config != RunnerUp.Config).Prepend(RunnerUp)).ToArray();
        return new DataFrame(
            new StringDataFrameColumn("best", leads.Select(_ => BestConfig)),
            new StringDataFrameColumn("other", leads.Select(l => l.Config)),
            new StringDataFrameColumn("other_label", leads.Select(l => l.Label)),
            new BooleanDataFrameColumn("other_is_baseline", leads.Select(l => l.Baseline)),
            new Int32DataFrameColumn("seeds_tested", leads.Select(l => l.Tested)),
            new Int32DataFrameColumn("lead_established", leads.Select(l => l.Established)),
            new DoubleDataFrameColumn("mean_difference", leads.Select(l => l.MeanDifference)));
    }

    /// <summary>The verdict in plain words, one short paragraph.</summary>
    public string Sentence()
    {
        var parts = new List<string>();
        string over = Seeds > 1 || Folds > 1 ? $", mean over {Repeats()}" : "";
        string interval = double.IsNaN(Low) ? "" : $" (95 % {IntervalKind}: {Pct(Low)} to {Pct(High)})";
        parts.Add($"Best config: {BestLabel}, test accuracy {Pct(Accuracy)}{interval}{over}.");
        if (RunnerUp is null) parts.Add("It is the only config with finished runs, so there is nothing to weigh it against.");
        else
        {
            var leads = new List<string> { Lead(RunnerUp, "the runner-up ") };
            leads.AddRange(Baselines.Where(b => b.Config != RunnerUp.Config).Select(b => Lead(b, "")));
            parts.Add("Its lead " + string.Join("; its lead ", leads) + ".");
            parts.Add("(Established means McNemar p < 0.05 and a paired bootstrap 95 % interval above 0, on the same test rows" +
                      (Seeds > 1 ? "; each seed is tested on its own, folds joined.)" : ".)"));
            parts.Add(CheapestLevelConfig is null
                ? "No cheaper config is level with it."
                : $"The cheapest config level with it is {CheapestLevelLabel} ({Count(CheapestLevelParameters)} parameters against {Count(BestParameters)}): no paired test tells them apart.");
        }
        if (SearchChoice is not null)
            parts.Add(SearchChoice == BestConfig
                ? "The search chose the same config by validation accuracy; its saved model is the one to ship."
                : $"The search chose {SearchChoiceLabel} by validation accuracy, and its saved model is the one to ship: " +
                  "picking the best on these test rows instead would spend them on the choice, and the figures above would then flatter it.");
        return string.Join(" ", parts);
    }

    /// <summary>"over X (+1.2 points, …) is established …" for one rival.</summary>
    static string Lead(LeadOver l, string role)
    {
        string points = double.IsNaN(l.MeanDifference) ? "" : $"{Points(l.MeanDifference)} points";
        if (l.Tested == 0) return $"over {role}{l.Label} could not be tested: the runs share no test rows";
        if (l.Tested == 1)
            return $"over {role}{l.Label} ({points}, 95 % interval {Points(l.Low)} to {Points(l.High)}, McNemar p {P(l.PValue)}) " +
                   (l.Established == 1 ? "is established" : "is not established");
        string status = l.Established == l.Tested ? $"is established in all {l.Tested} seeds"
            : l.Established == 0 ? $"is not established in any of the {l.Tested} seeds"
            : $"is established in {l.Established} of {l.Tested} seeds";
        return $"over {role}{l.Label} ({points} on average) {status}";
    }

    string Repeats() =>
        Seeds > 1 && Folds > 1 ? $"{Seeds} seeds × {Folds} folds" : Seeds > 1 ? $"{Seeds} seeds" : $"{Folds} folds";

    static string Pct(double v) => (100 * v).ToString("F1", Inv) + " %";
    static string Points(double v) => (v >= 0 ? "+" : "−") + Math.Abs(100 * v).ToString("F1", Inv);
    static string P(double p) => p < 1e-4 ? "< 0.0001" : "= " + p.ToString("0.####", Inv);
    static string Count(long v) => v.ToString("N0", Inv);
}
