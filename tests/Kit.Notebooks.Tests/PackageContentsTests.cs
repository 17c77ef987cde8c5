using System.IO.Compression;
using System.Reflection.Metadata;
using System.Reflection.PortableExecutable;
using System.Xml.Linq;

namespace Kit.Notebooks.Tests;

/// <summary>
/// What the shipped packages carry, read from the packed .nupkg files in the feed: Kit.Notebooks holds the kernel
/// extension and not the repository's notebook runner or feed builder; Kit depends on no headless browser (image
/// export is Kit.Export's job). Type names are read with System.Reflection.Metadata, without loading the assemblies.
/// </summary>
[Collection(FeedCollection.Name)]
public class PackageContentsTests(FeedFixture feed)
{
    /// <summary>The runner and feed types that lived in Kit.Notebooks before they moved to tools/Kit.Tools.</summary>
    static readonly string[] RunnerTypes =
    {
        "NotebookRunner", "LocalFeed", "NotebookFile", "NotebookFormatException", "NotebookHtml",
        "NotebookRunResult", "CellOutcome", "CellOutput", "CellStatus", "MarkdownLite", "PackageExtensionLoader",
    };

    /// <summary>Packages that drive a browser; the first is the one Kit.Export uses.</summary>
    static readonly string[] BrowserPackages = { "PuppeteerSharp", "Microsoft.Playwright", "Selenium.WebDriver" };

    [Fact]
    public void Kit_Notebooks_package_holds_the_extension_and_no_runner_or_feed_types()
    {
        using var zip = OpenPackage("Kit.Notebooks");
        var dlls = zip.Entries.Where(e => e.FullName.EndsWith(".dll", StringComparison.OrdinalIgnoreCase)).ToList();
        Assert.Equal(new[] { "interactive-extensions/dotnet/Kit.Notebooks.dll", "lib/net10.0/Kit.Notebooks.dll" },
            dlls.Select(e => e.FullName).Order(StringComparer.Ordinal));

        // Every type the tools assembly defines today, and the names that moved there, in case the tools change.
        var toolTypes = TypesIn(typeof(NotebookRunner).Assembly.Location).Types
            .Where(t => t.StartsWith("Kit.Tools.", StringComparison.Ordinal)).Select(Simple)
            .Concat(RunnerTypes).ToHashSet(StringComparer.Ordinal);
        Assert.Contains("NotebookRunner", toolTypes);

        foreach (var dll in dlls)
        {
            var (types, references) = TypesIn(dll);
            Assert.Contains("Kit.Notebooks.KitKernelExtension", types);
            Assert.Contains("Kit.Notebooks.LiveProgress", types);
            var leaked = types.Where(t => toolTypes.Contains(Simple(t)) || t.StartsWith("Kit.Tools", StringComparison.Ordinal)).ToList();
            Assert.True(leaked.Count == 0, $"{dll.FullName} carries runner or feed types: {string.Join(", ", leaked)}");
            Assert.DoesNotContain("Kit.Tools", references);
            Assert.DoesNotContain("Microsoft.DotNet.Interactive.Documents", references);
            Assert.DoesNotContain("Microsoft.DotNet.Interactive.PackageManagement", references);
        }

        var dependencies = Dependencies(zip, "Kit.Notebooks");
        Assert.Contains("Kit", dependencies);
        Assert.Contains("Microsoft.DotNet.Interactive", dependencies);
        // #r nuget in an embedded kernel is the runner's need; the real kernel brings its own. (Documents stays listed:
        // Microsoft.DotNet.Interactive depends on it, and central transitive pinning writes it into the .nuspec.)
        Assert.DoesNotContain("Microsoft.DotNet.Interactive.PackageManagement", dependencies);
        Assert.DoesNotContain(dependencies, d => BrowserPackages.Contains(d, StringComparer.OrdinalIgnoreCase));
    }

    [Fact]
    public void Kit_project_and_package_have_no_headless_browser_dependency()
    {
        var kit = PackageReferences(Path.Combine(feed.RepoRoot, "src", "Kit", "Kit.csproj"));
        Assert.Contains("TorchSharp-cpu", kit);   // the reader finds the references that are there
        Assert.DoesNotContain(kit, r => BrowserPackages.Contains(r, StringComparer.OrdinalIgnoreCase));
        // The browser package moved rather than vanished: the same check finds it in Kit.Export.
        Assert.Contains("PuppeteerSharp", PackageReferences(Path.Combine(feed.RepoRoot, "src", "Kit.Export", "Kit.Export.csproj")));

        using var zip = OpenPackage("Kit");
        var dependencies = Dependencies(zip, "Kit");
        Assert.Contains("TorchSharp-cpu", dependencies);
        Assert.DoesNotContain(dependencies, d => BrowserPackages.Contains(d, StringComparer.OrdinalIgnoreCase));

        var (types, references) = TypesIn(zip.GetEntry("lib/net10.0/Kit.dll") ?? throw new Xunit.Sdk.XunitException("Kit package has no lib/net10.0/Kit.dll"));
        Assert.Contains("Kit.Views.ReportWriter", types);
        Assert.DoesNotContain(types, t => Simple(t) is "HeadlessBrowser" or "BrowserPage" or "ReportExport");
        Assert.DoesNotContain(references, r => BrowserPackages.Contains(r, StringComparer.OrdinalIgnoreCase));
    }

    ZipArchive OpenPackage(string id)
    {
        string path = Path.Combine(feed.Feed, $"{id}.{LocalFeed.PackageVersion(feed.RepoRoot)}.nupkg");
        Assert.True(File.Exists(path), $"{path} was not packed");
        return ZipFile.OpenRead(path);
    }

    static string Simple(string fullName) => fullName[(fullName.LastIndexOf('.') + 1)..];

    /// <summary>Ids of the package's dependencies, from the .nuspec inside it.</summary>
    static HashSet<string> Dependencies(ZipArchive zip, string id)
    {
        using var stream = (zip.GetEntry($"{id}.nuspec") ?? throw new Xunit.Sdk.XunitException($"no {id}.nuspec in the package")).Open();
        var doc = XDocument.Load(stream);
        return doc.Descendants().Where(e => e.Name.LocalName == "dependency")
            .Select(e => (string?)e.Attribute("id") ?? "").ToHashSet(StringComparer.OrdinalIgnoreCase);
    }

    static HashSet<string> PackageReferences(string csproj) =>
        XDocument.Load(csproj).Descendants("PackageReference").Select(e => (string?)e.Attribute("Include") ?? "")
            .ToHashSet(StringComparer.OrdinalIgnoreCase);

    static (List<string> Types, HashSet<string> References) TypesIn(ZipArchiveEntry entry)
    {
        using var stream = entry.Open();
        var copy = new MemoryStream();
        stream.CopyTo(copy);
        copy.Position = 0;
        return TypesIn(copy);
    }

    static (List<string> Types, HashSet<string> References) TypesIn(string path)
    {
        using var stream = File.OpenRead(path);
        return TypesIn(stream);
    }

    /// <summary>Full names of the top-level types an assembly defines, and the names of the assemblies it references.</summary>
    static (List<string> Types, HashSet<string> References) TypesIn(Stream stream)
    {
        using var pe = new PEReader(stream, PEStreamOptions.LeaveOpen);
        var md = pe.GetMetadataReader();
        var types = md.TypeDefinitions.Select(h => md.GetTypeDefinition(h))
            .Where(t => t.GetDeclaringType().IsNil)
            .Select(t => (Namespace: md.GetString(t.Namespace), Name: md.GetString(t.Name)))
            .Where(t => t.Name != "<Module>")
            .Select(t => t.Namespace.Length == 0 ? t.Name : t.Namespace + "." + t.Name)
            .ToList();
        var references = md.AssemblyReferences.Select(h => md.GetString(md.GetAssemblyReference(h).Name)).ToHashSet(StringComparer.Ordinal);
        return (types, references);
    }
}
