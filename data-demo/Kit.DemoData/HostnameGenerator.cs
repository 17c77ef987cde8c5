using System.Text;

namespace Kit.DemoData;

/// <summary>
/// Invented hostnames labelled by the generator family that made them. Every name is built from our own
/// syllable and role inventories plus the reserved top-level names of RFC 2606 (.test, .example, .invalid),
/// so no real brand, domain, person or place appears. Rows come in groups (a zone or campaign): members of a
/// group share a suffix and often a stem, which is what a leakage-aware split must keep together.
/// </summary>
public static class HostnameGenerator
{
    public sealed record Family(string Label, int Rows);

    /// <summary>Class sizes: long-tailed on purpose, largest : smallest is about 10 : 1.</summary>
    public static readonly IReadOnlyList<Family> Families = new Family[]
    {
        new("wordlike", 6500),
        new("infra", 4200),
        new("word-digit", 3300),
        new("hex-digest", 2200),
        new("compound", 1600),
        new("churn", 1400),
        new("label-chain", 640),
    };

    static readonly string[] Onsets = { "b", "d", "f", "g", "k", "l", "m", "n", "p", "r", "s", "t", "v", "z", "br", "dr", "tr", "st", "pl", "gr", "sh", "th", "ch", "kl" };
    static readonly string[] Vowels = { "a", "e", "i", "o", "u", "a", "e", "o", "ai", "ou", "ea", "io" };
    static readonly string[] Codas = { "", "", "", "n", "r", "l", "s", "m", "t", "x", "nd", "rk" };
    static readonly string[] Roles = { "db", "app", "gw", "mq", "cache", "build", "edge", "log", "auth", "mail", "stor", "mon", "ci", "api", "lb", "vpn", "ns", "sql" };
    static readonly string[] Reserved = { "test", "example", "invalid" };
    const string Hex = "0123456789abcdef";
    const string Base32 = "abcdefghijkmnpqrstuvwxyz23456789";
    const string ChurnHeavy = "bcdfghjklmnpqrstvwxzbcdfgkmnprstvxz";
    const string ChurnVowels = "aeiouy";

    public static IEnumerable<DemoRow> Generate(ulong seed = 20261201)
    {
        var rng = new SeededRandom(seed);
        var rows = new List<DemoRow>();
        int groupNo = 0;
        foreach (var family in Families)
        {
            int made = 0;
            while (made < family.Rows)
            {
                // Group sizes are long-tailed too: most zones are small, a few are large.
                int size = Math.Min(family.Rows - made, 1 + rng.Tail(0.82, 40));
                var zone = NewZone(rng, family.Label);
                string group = $"z{++groupNo:D4}";
                for (int i = 0; i < size; i++)
                {
                    string host;
                    int guard = 0;
                    do host = Host(rng, family.Label, zone);
                    while ((host.Length < 3 || host.Length > 60) && ++guard < 100);
                    if (host.Length > 60) host = host[..60].TrimEnd('.', '-');
                    rows.Add(new DemoRow(host, family.Label, group));
                    made++;
                }
            }
        }
        // Interleave classes so the file does not read as sorted blocks; the order is part of the seed.
        return Shuffle(rows, rng);
    }

    sealed record Zone(string Suffix, string Stem, string Site, double SuffixRate);

    static Zone NewZone(SeededRandom rng, string family)
    {
        string tld = rng.Pick(Reserved);
        string zoneWord = Word(rng, rng.Between(1, 2));
        string suffix = rng.Chance(0.5) ? $"{zoneWord}.{tld}" : tld;
        // Some families are mostly seen bare (a label alone), others nearly always with a zone.
        double rate = family switch
        {
            "infra" => 0.8,
            "label-chain" => 0.9,
            "hex-digest" => 0.35,
            "churn" => 0.3,
            _ => 0.45,
        };
        return new Zone(suffix, Word(rng, rng.Between(1, 3)), $"{rng.Pick(new[] { "dc", "rk", "pod", "zn", "site" })}{rng.Between(1, 40)}", rate);
    }

    static string Host(SeededRandom rng, string family, Zone zone)
    {
        string label = family switch
        {
            "wordlike" => Word(rng, rng.Between(2, 4) + rng.Tail(0.15, 3)),
            "compound" => Word(rng, rng.Between(1, 3)) + (rng.Chance(0.45) ? "-" : "") + Word(rng, rng.Between(1, 3)),
            "word-digit" => WordDigit(rng, zone),
            "hex-digest" => Repeat(rng, Hex, rng.Chance(0.7) ? rng.Pick(new[] { 8, 12, 16, 20 }) : rng.Between(6, 20) + rng.Tail(0.9, 24)),
            "churn" => Churn(rng),
            "infra" => Infra(rng, zone),
            "label-chain" => string.Join(".", Enumerable.Range(0, rng.Between(2, 4) + rng.Tail(0.5, 4)).Select(_ => Repeat(rng, Base32, rng.Between(3, 8)))),
            _ => throw new ArgumentException(family),
        };
        return rng.Chance(zone.SuffixRate) ? $"{label}.{zone.Suffix}" : label;
    }

    static string Word(SeededRandom rng, int syllables)
    {
        var sb = new StringBuilder();
        for (int s = 0; s < syllables; s++)
        {
            if (s > 0 || rng.Chance(0.85)) sb.Append(rng.Pick(Onsets));
            sb.Append(rng.Pick(Vowels));
            if (rng.Chance(0.45)) sb.Append(rng.Pick(Codas));
        }
        return sb.ToString();
    }

    static string WordDigit(SeededRandom rng, Zone zone)
    {
        string stem = rng.Chance(0.6) ? zone.Stem : Word(rng, rng.Between(1, 3));
        string digits = rng.Between(0, 99999).ToString().PadLeft(rng.Between(1, 5), '0');
        if (digits.Length > 5) digits = digits[^5..];
        return rng.Next(3) switch
        {
            0 => stem + digits,
            1 => digits + stem,
            _ => stem[..Math.Max(1, stem.Length / 2)] + digits + stem[Math.Max(1, stem.Length / 2)..],
        };
    }

    static string Churn(SeededRandom rng)
    {
        int n = rng.Between(5, 14) + rng.Tail(0.4, 10);
        var sb = new StringBuilder(n);
        for (int i = 0; i < n; i++)
        {
            double r = rng.NextDouble();
            sb.Append(r < 0.18 ? ChurnVowels[rng.Next(ChurnVowels.Length)]
                    : r < 0.24 ? (char)('0' + rng.Next(10))
                    : ChurnHeavy[rng.Next(ChurnHeavy.Length)]);
        }
        return sb.ToString();
    }

    static string Infra(SeededRandom rng, Zone zone)
    {
        string role = rng.Pick(Roles);
        string num = rng.Between(1, 60).ToString(rng.Chance(0.7) ? "D2" : "D1");
        string sep = rng.Chance(0.7) ? "-" : "";
        string name = $"{role}{sep}{num}";
        if (rng.Chance(0.6)) name += $".{zone.Site}";
        if (rng.Chance(0.15)) name = $"{rng.Pick(new[] { "prod", "stg", "dev", "qa" })}-{name}";
        return name;
    }

    static string Repeat(SeededRandom rng, string alphabet, int n)
    {
        var chars = new char[n];
        for (int i = 0; i < n; i++) chars[i] = alphabet[rng.Next(alphabet.Length)];
        return new string(chars);
    }

    internal static List<DemoRow> Shuffle(List<DemoRow> rows, SeededRandom rng)
    {
        for (int i = rows.Count - 1; i > 0; i--)
        {
            int j = rng.Next(i + 1);
            (rows[i], rows[j]) = (rows[j], rows[i]);
        }
        return rows;
    }
}
