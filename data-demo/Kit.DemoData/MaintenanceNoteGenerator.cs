namespace Kit.DemoData;

/// <summary>
/// Invented technician notes labelled with one of five fault categories. Notes mix words that point to the
/// category with shared shop-floor filler and, sometimes, a misleading word from another category, so word
/// order and context matter. The group is the asset the note was written about (several notes per asset).
/// </summary>
public static class MaintenanceNoteGenerator
{
    public static readonly IReadOnlyList<(string Label, int Rows)> Categories = new[]
    {
        ("electrical", 1700),
        ("mechanical", 1500),
        ("hydraulic", 1200),
        ("controls", 900),
        ("thermal", 700),
    };

    static readonly Dictionary<string, string[]> Symptoms = new()
    {
        ["electrical"] = new[] { "breaker tripped", "fuse blown", "no power at panel", "contactor chatter", "loose terminal", "earth fault alarm", "motor wont start", "cable insulation cracked", "voltage drop under load", "sparking at connector", "overload relay tripped", "phase missing" },
        ["mechanical"] = new[] { "bearing noise", "belt slipping", "shaft misaligned", "coupling worn", "gearbox rattle", "excess vibration", "chain stretched", "bolt sheared", "roller seized", "guard bent", "key sheared on pulley", "grinding noise from drive" },
        ["hydraulic"] = new[] { "oil leak at fitting", "pressure low", "hose burst", "cylinder drifting", "pump whine", "valve sticking", "seal weeping", "fluid level low", "accumulator flat", "relief valve lifting", "aeration in reservoir", "slow ram return" },
        ["controls"] = new[] { "plc fault code", "sensor not reading", "hmi frozen", "encoder count wrong", "limit switch not made", "interlock bypassed", "program step stuck", "io card failed", "comms timeout to drive", "setpoint drifting", "proximity sensor dirty", "recipe not loading" },
        ["thermal"] = new[] { "overheating", "coolant flow low", "fan not turning", "heat exchanger fouled", "thermostat stuck", "temperature alarm", "chiller tripped", "radiator blocked", "hot spot on housing", "heater element open", "thermal cutout active", "cooling fins clogged" },
    };

    static readonly Dictionary<string, string[]> Actions = new()
    {
        ["electrical"] = new[] { "replaced fuse", "reset breaker", "retightened terminals", "meggered motor", "swapped contactor", "rewired connector" },
        ["mechanical"] = new[] { "replaced bearing", "realigned shaft", "tensioned belt", "fitted new coupling", "greased drive", "replaced chain" },
        ["hydraulic"] = new[] { "replaced hose", "topped up oil", "changed seals", "bled system", "cleaned valve", "recharged accumulator" },
        ["controls"] = new[] { "reloaded program", "recalibrated sensor", "replaced io card", "cleared fault", "adjusted limit switch", "rebooted hmi" },
        ["thermal"] = new[] { "cleaned fins", "replaced fan", "flushed coolant", "replaced thermostat", "descaled exchanger", "reset cutout" },
    };

    static readonly string[] Openers = { "operator reports", "found", "on arrival", "night shift says", "checked", "called out for", "during pm noticed", "line stopped", "intermittent", "recurring" };
    static readonly string[] Fillers = { "after restart", "ok now", "monitor next shift", "parts ordered", "ran test cycle", "no further issue", "left running", "informed supervisor", "tagged out", "needs follow up", "see previous note", "again this week" };
    static readonly string[] Machines = { "press", "conveyor", "mixer", "packer", "lathe", "extruder", "palletiser", "filler", "cutter", "oven", "compressor", "winder" };

    public static IEnumerable<DemoRow> Generate(ulong seed = 20261202)
    {
        var rng = new SeededRandom(seed);
        var labels = Categories.Select(c => c.Label).ToArray();
        // Assets lean towards a few categories, which is what makes the group column matter for splits.
        int assets = 700;
        var lean = Enumerable.Range(0, assets).Select(_ => rng.Pick(labels)).ToArray();
        var machine = Enumerable.Range(0, assets).Select(_ => rng.Pick(Machines)).ToArray();
        var rows = new List<DemoRow>();
        foreach (var (label, count) in Categories)
        {
            var candidates = Enumerable.Range(0, assets).Where(a => lean[a] == label).ToArray();
            for (int i = 0; i < count; i++)
            {
                int asset = rng.Chance(0.7) && candidates.Length > 0 ? rng.Pick(candidates) : rng.Next(assets);
                rows.Add(new DemoRow(Note(rng, label, labels, machine[asset], asset), label, $"asset-{asset:D4}"));
            }
        }
        return HostnameGenerator.Shuffle(rows, rng);
    }

    static string Note(SeededRandom rng, string label, string[] labels, string machine, int asset)
    {
        var parts = new List<string>();
        if (rng.Chance(0.7)) parts.Add(rng.Pick(Openers));
        if (rng.Chance(0.6)) parts.Add($"{machine} {asset % 40 + 1}");
        parts.Add(rng.Pick(Symptoms[label]));
        if (rng.Chance(0.35)) parts.Add("and " + rng.Pick(Symptoms[label]));
        // A misleading symptom from another category, the way real notes mention what was ruled out.
        if (rng.Chance(0.3))
        {
            string other = rng.Pick(labels.Where(l => l != label).ToArray());
            parts.Add((rng.Chance(0.5) ? "no " : "checked ") + rng.Pick(Symptoms[other]));
        }
        if (rng.Chance(0.65)) parts.Add(rng.Pick(Actions[label]));
        int extra = rng.Tail(0.45, 6);
        for (int i = 0; i < extra; i++) parts.Add(rng.Pick(Fillers));
        var words = string.Join(" ", parts).Split(' ');
        if (words.Length > 40) words = words[..40];
        if (words.Length < 3) words = words.Concat(rng.Pick(Fillers).Split(' ')).ToArray();
        return string.Join(" ", words);
    }
}
