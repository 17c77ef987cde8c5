using System.Diagnostics;
using System.IO.Compression;
using System.Xml.Linq;
using Kit.Tests.Experiments;

namespace Kit.Tests.Onnx;

/// <summary>The service-side package: packed as NuGet would ship it, its .nuspec lists ONNX Runtime and neither TorchSharp nor the kit.</summary>
public sealed class ScoringPackageTests : IDisposable
{
    readonly string _dir = OnnxSamples.TempDir();

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    [Fact]
    public async Task Kit_Scoring_depends_on_onnx_runtime_and_not_on_torchsharp()
    {
        string project = Path.Combine(KitCli.RepoRoot(), "src", "Kit.Scoring", "Kit.Scoring.csproj");
        // --no-build: the test run has just built Kit.Scoring (Release), and a second build could race other tests.
        var start = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { "pack", project, "-c", "Release", "--no-build", "-o", _dir, "--nologo", "-nodeReuse:false" }) start.ArgumentList.Add(a);
        using (var p = Process.Start(start)!)
        {
            var output = p.StandardOutput.ReadToEndAsync();
            var errors = p.StandardError.ReadToEndAsync();
            await p.WaitForExitAsync();
            Assert.True(p.ExitCode == 0, $"dotnet pack failed: {await output}\n{await errors}");
        }
        string package = Directory.GetFiles(_dir, "Kit.Scoring.*.nupkg").Single();
        using var zip = ZipFile.OpenRead(package);
        var nuspecEntry = zip.Entries.Single(e => e.FullName.EndsWith(".nuspec", StringComparison.Ordinal));
        using var stream = nuspecEntry.Open();
        var nuspec = XDocument.Load(stream);
        var ids = nuspec.Descendants().Where(e => e.Name.LocalName == "dependency").Select(e => (string)e.Attribute("id")!).ToArray();
        Assert.Contains("Microsoft.ML.OnnxRuntime", ids);
        Assert.DoesNotContain(ids, id => id.Contains("TorchSharp", StringComparison.OrdinalIgnoreCase) || id.Contains("libtorch", StringComparison.OrdinalIgnoreCase));
        Assert.DoesNotContain("Kit", ids);
        Assert.Equal("Kit.Scoring", nuspec.Descendants().Single(e => e.Name.LocalName == "id").Value);
        Assert.DoesNotContain(zip.Entries, e => e.FullName.Contains("torch", StringComparison.OrdinalIgnoreCase));
    }
}
