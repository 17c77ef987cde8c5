using Kit.Views;

namespace Kit.Notebooks.Tests;

public class SparklineTests
{
    [Fact]
    public void Points_are_scaled_into_the_padded_box_with_y_pointing_up()
    {
        string svg = Sparkline.Svg(new (IReadOnlyList<(double, double)>, string)[] { (new[] { (0.0, 0.0), (0.5, 5.0), (1.0, 10.0) }, "#000") }, width: 100, height: 20);
        // pad 3: x 0 -> 3, 1 -> 97; y min -> 20-3 = 17, max -> 3.
        Assert.Contains("points=\"3.0,17.0 50.0,10.0 97.0,3.0 \"", svg);
    }

    [Fact]
    public void Non_finite_values_are_skipped_and_a_flat_series_sits_in_the_middle()
    {
        string svg = Sparkline.Svg(new (IReadOnlyList<(double, double)>, string)[] { (new[] { (0.0, 2.0), (0.5, double.NaN), (1.0, 2.0) }, "#000") }, width: 100, height: 20);
        Assert.Contains("points=\"3.0,10.0 97.0,10.0 \"", svg);
    }
}

public class MarkdownLiteTests
{
    [Fact]
    public void Headings_lists_code_and_emphasis()
    {
        string html = MarkdownLite.ToHtml("# Title\n\nSome **bold** and *soft* `code`.\n\n- one\n- two\n\n1. first\n\n```\nx < 1\n```");
        Assert.Equal("<h1>Title</h1><p>Some <strong>bold</strong> and <em>soft</em> <code>code</code>.</p><ul><li>one</li><li>two</li></ul><ol><li>first</li></ol><pre><code>x &lt; 1\n</code></pre>", html);
    }

    [Fact]
    public void Markup_in_prose_is_escaped_and_script_links_are_dropped()
    {
        string html = MarkdownLite.ToHtml("<script>alert(1)</script> [ok](https://example.org/a) [bad](javascript:alert(1))");
        Assert.DoesNotContain("<script>", html);
        Assert.Contains("&lt;script&gt;", html);
        Assert.Contains("<a href=\"https://example.org/a\">ok</a>", html);
        Assert.DoesNotContain("javascript:", html.Replace("[bad]", ""), StringComparison.Ordinal);
    }
}

public class ViewRegistryTests
{
    public abstract record Shape(string Name);
    public sealed record Square(string Name, int Side) : Shape(Name);
    public interface ITagged { string Tag { get; } }
    public sealed record Tagged(string Tag) : ITagged;
    public sealed record Unregistered(int X);

    [Fact]
    public void Lookup_uses_the_type_then_its_base_types_then_interfaces()
    {
        ViewRegistry.Register<Shape>(s => new TextView("shape", s.Name));
        ViewRegistry.Register<ITagged>(t => new TextView("tagged", t.Tag));

        Assert.True(ViewRegistry.TryGetView(new Square("sq", 2), out var square));
        Assert.Equal("shape", square.Title);
        Assert.True(ViewRegistry.TryGetView(new Tagged("t1"), out var tagged));
        Assert.Equal("t1", tagged.ToHtml());
        Assert.False(ViewRegistry.TryGetView(new Unregistered(1), out _));
        Assert.False(ViewRegistry.TryGetView(null, out _));

        ViewRegistry.Register<Square>(s => new TextView("square", s.Side.ToString()));
        Assert.True(ViewRegistry.TryGetView(new Square("sq", 3), out var specific));
        Assert.Equal("square", specific.Title);
    }

    [Fact]
    public void A_later_registration_replaces_the_earlier_one_and_is_announced()
    {
        var announced = new List<Type>();
        void OnRegistered(Type t) => announced.Add(t);
        ViewRegistry.Registered += OnRegistered;
        try
        {
            ViewRegistry.Register<Unregistered2>(u => new TextView("first", ""));
            ViewRegistry.Register<Unregistered2>(u => new TextView("second", ""));
        }
        finally { ViewRegistry.Registered -= OnRegistered; }
        Assert.True(ViewRegistry.TryGetView(new Unregistered2(), out var view));
        Assert.Equal("second", view.Title);
        Assert.Equal(2, announced.Count(t => t == typeof(Unregistered2)));
        Assert.Contains(typeof(Unregistered2), ViewRegistry.Types);
    }

    public sealed record Unregistered2;
}

public class LocalFeedTests
{
    [Fact]
    public void The_source_hash_follows_sources_and_ignores_build_output()
    {
        string repo = Directory.CreateTempSubdirectory("kit-feed-hash-").FullName;
        try
        {
            Directory.CreateDirectory(Path.Combine(repo, "src", "Kit", "obj"));
            Directory.CreateDirectory(Path.Combine(repo, "src", "Kit.Notebooks", "bin"));
            File.WriteAllText(Path.Combine(repo, "src", "Kit", "A.cs"), "class A {}");
            File.WriteAllText(Path.Combine(repo, "src", "Kit.Notebooks", "B.cs"), "class B {}");
            string first = LocalFeed.SourceHash(repo);

            File.WriteAllText(Path.Combine(repo, "src", "Kit", "obj", "junk.cs"), "changes every build");
            File.WriteAllText(Path.Combine(repo, "src", "Kit.Notebooks", "bin", "x.dll"), "binary");
            Assert.Equal(first, LocalFeed.SourceHash(repo));

            File.WriteAllText(Path.Combine(repo, "src", "Kit", "A.cs"), "class A { int x; }");
            Assert.NotEqual(first, LocalFeed.SourceHash(repo));
        }
        finally { Directory.Delete(repo, recursive: true); }
    }

    [Fact]
    public void The_repository_root_is_found_from_below_and_a_stray_folder_is_named()
    {
        string root = LocalFeed.FindRepoRoot(AppContext.BaseDirectory);
        Assert.True(File.Exists(Path.Combine(root, "Kit.sln")));
        var e = Assert.Throws<DirectoryNotFoundException>(() => LocalFeed.FindRepoRoot("/"));
        Assert.Contains("Kit.sln", e.Message);
    }
}

public class CacheEvictionTests
{
    [Fact]
    public void An_extracted_copy_is_kept_only_when_its_recorded_checksum_is_the_feed_package()
    {
        string root = Directory.CreateTempSubdirectory("kit-evict-").FullName;
        try
        {
            string package = Path.Combine(root, "Kit.0.1.0.nupkg");
            File.WriteAllBytes(package, new byte[] { 1, 2, 3 });
            string extracted = Path.Combine(root, "cache", "kit", "0.1.0");
            Directory.CreateDirectory(extracted);
            // NuGet records base64(SHA-512(package bytes)) in <id>.<version>.nupkg.sha512 when it extracts.
            string same = Convert.ToBase64String(System.Security.Cryptography.SHA512.HashData(new byte[] { 1, 2, 3 }));
            File.WriteAllText(Path.Combine(extracted, "kit.0.1.0.nupkg.sha512"), same);

            LocalFeed.EvictIfDifferent(package, extracted, null);
            Assert.True(Directory.Exists(extracted));

            File.WriteAllBytes(package, new byte[] { 1, 2, 4 });
            LocalFeed.EvictIfDifferent(package, extracted, null);
            Assert.False(Directory.Exists(extracted));
        }
        finally { Directory.Delete(root, recursive: true); }
    }
}
