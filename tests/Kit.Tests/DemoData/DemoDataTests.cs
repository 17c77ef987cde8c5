using Kit.DemoData;

namespace Kit.Tests.DemoData;

public class DemoDataTests
{
    internal static string RepoRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "Kit.sln"))) return dir.FullName;
        throw new InvalidOperationException("repository root (Kit.sln) not found above " + AppContext.BaseDirectory);
    }

    [Fact]
    public void Committed_demo_files_equal_a_fresh_generation_bit_for_bit()
    {
        string root = RepoRoot();
        foreach (var (name, rows) in DemoFiles.All())
        {
            byte[] committed = File.ReadAllBytes(Path.Combine(root, "data-demo", name));
            byte[] fresh = DemoFiles.ToCsv(rows);
            Assert.True(committed.AsSpan().SequenceEqual(fresh), $"data-demo/{name} differs from a fresh generation; run `kit demo-data --out data-demo`");
        }
    }

    [Fact]
    public void Hostnames_meet_the_stated_shape()
    {
        var rows = HostnameGenerator.Generate().ToList();
        Assert.InRange(rows.Count, 19_000, 21_000);
        var counts = rows.GroupBy(r => r.Label).ToDictionary(g => g.Key, g => g.Count());
        Assert.True(counts.Count >= 6, "at least six generator families");
        Assert.True(counts.Values.Max() >= 10 * counts.Values.Min(), $"imbalance {counts.Values.Max()}:{counts.Values.Min()} should be at least 10:1");
        Assert.All(rows, r => Assert.InRange(r.Text.Length, 3, 60));
        var lengths = rows.Select(r => r.Text.Length).OrderBy(l => l).ToArray();
        // Long tail: the 99th percentile sits well above the median.
        Assert.True(lengths[(int)(0.99 * lengths.Length)] >= 2 * lengths[lengths.Length / 2]);
        // Groups never mix labels, and most groups hold more than one row (so a random split would leak).
        Assert.All(rows.GroupBy(r => r.Group), g => Assert.Single(g.Select(r => r.Label).Distinct()));
        Assert.True(rows.GroupBy(r => r.Group).Count() < rows.Count / 2);
        // Only the reserved names of RFC 2606 appear as a top-level label.
        var reserved = new HashSet<string> { "test", "example", "invalid" };
        Assert.All(rows.Where(r => r.Text.Contains('.')), r =>
        {
            string tld = r.Text[(r.Text.LastIndexOf('.') + 1)..];
            Assert.True(reserved.Contains(tld) || r.Label is "label-chain" or "infra", $"unexpected top-level label in {r.Text}");
        });
    }

    [Fact]
    public void Maintenance_notes_have_five_categories_and_3_to_40_words()
    {
        var rows = MaintenanceNoteGenerator.Generate().ToList();
        Assert.InRange(rows.Count, 5_500, 6_500);
        Assert.Equal(5, rows.Select(r => r.Label).Distinct().Count());
        Assert.All(rows, r => Assert.InRange(r.Text.Split(' ').Length, 3, 40));
    }

    [Fact]
    public void Generation_is_deterministic_and_seed_dependent()
    {
        var a = DemoFiles.ToCsv(HostnameGenerator.Generate(5));
        var b = DemoFiles.ToCsv(HostnameGenerator.Generate(5));
        var c = DemoFiles.ToCsv(HostnameGenerator.Generate(6));
        Assert.Equal(a, b);
        Assert.NotEqual(a, c);
    }
}
