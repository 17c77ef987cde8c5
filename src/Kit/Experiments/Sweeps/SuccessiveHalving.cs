using System.Globalization;

namespace Kit.Experiments;

/// <summary>One planned rung of successive halving: how many configs train, for how many epochs.</summary>
public sealed record RungPlan(int Rung, int Configs, int Epochs);

/// <summary>What the wall-clock budget allows for a rung: its epochs (maybe fewer than planned), or a stop.</summary>
public sealed record BudgetCall(bool Stop, int Epochs, double EstimatedSeconds, string Note);

/// <summary>
/// Successive halving (Jamieson &amp; Talwalkar 2016, "Non-stochastic Best Arm Identification and Hyperparameter
/// Optimization", AISTATS): train every config on a small budget, keep the best 1/η by a held-out score, give the
/// survivors η times the budget, and repeat. The search here runs it rung by rung as Li et al. 2018 ("Massively
/// Parallel Hyperparameter Tuning", the asynchronous form, ASHA) lay it out for many workers: a rung's runs go to
/// whichever shard owns them, and a promotion is made from the rung's records in the store. Unlike ASHA's
/// promote-as-soon-as-possible rule, a promotion here waits for the whole rung, so the survivors never depend on
/// which shard was faster and a rerun reproduces them.
/// </summary>
public static class SuccessiveHalving
{
    /// <summary>η, the factor between rungs (3, the value both papers use in their experiments).</summary>
    public const int DefaultEta = 3;

    /// <summary>
    /// The rungs for <paramref name="configs"/> configs and at most <paramref name="maxEpochs"/> epochs: rung k trains
    /// ⌊N / η^k⌋ configs for r·η^k epochs (the last capped at the maximum), with K = ⌊log_η N⌋ halvings and the first
    /// rung's r = ⌈E / η^K⌉ so the last rung reaches E. Rungs stop early when the epochs cannot grow any more.
    /// N = 12, η = 3, E = 9: 12 configs × 1 epoch, 4 × 3, 1 × 9.
    /// </summary>
    public static IReadOnlyList<RungPlan> Schedule(int configs, int maxEpochs, int eta = DefaultEta)
    {
        if (configs < 1) throw new ArgumentException($"successive halving needs at least one config, not {configs}");
        if (maxEpochs < 1) throw new ArgumentException($"successive halving needs at least one epoch, not {maxEpochs}");
        if (eta < 2) throw new ArgumentException($"η = {eta}: the factor between rungs must be at least 2");
        int halvings = 0;
        for (long n = configs; n >= eta; n /= eta) halvings++;
        long first = Math.Max(1, (long)Math.Ceiling(maxEpochs / Math.Pow(eta, halvings)));
        var rungs = new List<RungPlan>();
        long count = configs;
        for (int k = 0; k <= halvings; k++)
        {
            int epochs = (int)Math.Min(maxEpochs, first * (long)Math.Pow(eta, k));
            if (k == halvings) epochs = maxEpochs;
            if (rungs.Count > 0 && epochs <= rungs[^1].Epochs) break;
            rungs.Add(new RungPlan(k, (int)Math.Max(1, count), epochs));
            count /= eta;
        }
        return rungs;
    }

    /// <summary>
    /// The best <paramref name="keep"/> of a finished rung by validation accuracy (never the test part); ties go to
    /// the config drawn earlier, so the order is fixed by the search's seed alone.
    /// </summary>
    public static IReadOnlyList<string> Promote(IReadOnlyList<(string Config, double ValidationAccuracy)> rung, int keep) =>
        rung.Select((r, i) => (r.Config, Score: double.IsFinite(r.ValidationAccuracy) ? r.ValidationAccuracy : double.NegativeInfinity, i))
            .OrderByDescending(r => r.Score).ThenBy(r => r.i).Take(keep).Select(r => r.Config).ToArray();

    /// <summary>
    /// Fits a rung into what is left of the budget: <paramref name="secondsPerEpoch"/> is the summed measured seconds
    /// per epoch of the rung's configs (from their previous rung), <paramref name="lanes"/> how many run at once. The
    /// planned epochs when they fit; otherwise the most that fit, as long as that is more than the previous rung gave;
    /// otherwise a stop.
    /// </summary>
    public static BudgetCall Fit(int plannedEpochs, int previousEpochs, double secondsPerEpoch, int lanes, double remainingSeconds)
    {
        var inv = CultureInfo.InvariantCulture;
        double Cost(int epochs) => secondsPerEpoch * epochs / Math.Max(1, lanes);
        double planned = Cost(plannedEpochs);
        if (planned <= remainingSeconds)
            return new BudgetCall(false, plannedEpochs, planned, string.Create(inv, $"fits: about {planned:F0} s of {remainingSeconds:F0} s left"));
        int fit = secondsPerEpoch <= 0 ? plannedEpochs : (int)Math.Floor(remainingSeconds * Math.Max(1, lanes) / secondsPerEpoch);
        if (fit > previousEpochs)
            return new BudgetCall(false, fit, Cost(fit), string.Create(inv,
                $"budget cut: {plannedEpochs} epochs would take about {planned:F0} s but {Math.Max(0, remainingSeconds):F0} s are left; shrunk to {fit} epochs"));
        return new BudgetCall(true, 0, planned, string.Create(inv,
            $"budget cut: {plannedEpochs} epochs would take about {planned:F0} s but {Math.Max(0, remainingSeconds):F0} s are left, too little for more than the previous rung's {previousEpochs}; search stopped"));
    }

    /// <summary>"15m", "90s", "1h", "1h30m" or "2.5m" as a duration; an <see cref="ArgumentException"/> otherwise.</summary>
    public static TimeSpan ParseBudget(string text)
    {
        var m = System.Text.RegularExpressions.Regex.Match(text.Trim().ToLowerInvariant(), @"^(?:(\d+(?:\.\d+)?)h)?(?:(\d+(?:\.\d+)?)m)?(?:(\d+(?:\.\d+)?)s)?$");
        if (!m.Success || text.Trim().Length == 0 || (!m.Groups[1].Success && !m.Groups[2].Success && !m.Groups[3].Success))
            throw new ArgumentException($"--budget '{text}': expected a duration such as 90s, 15m, 1h or 1h30m");
        double Part(int g) => m.Groups[g].Success ? double.Parse(m.Groups[g].Value, CultureInfo.InvariantCulture) : 0;
        var budget = TimeSpan.FromSeconds(Part(1) * 3600 + Part(2) * 60 + Part(3));
        if (budget <= TimeSpan.Zero) throw new ArgumentException($"--budget '{text}': the budget must be more than zero");
        return budget;
    }
}
