using System.Diagnostics;
using System.Security.Cryptography;
using Kit.Native;
using TorchSharp;
using static TorchSharp.torch;

namespace Kit.Tests.Native;

public class EngineTests
{
    static string Glue() => Engine.FindGlue(typeof(torch).Assembly) ?? throw new InvalidOperationException("TorchSharp glue not found");

    [Fact]
    public void Relaxing_a_copy_changes_exactly_the_reported_bytes()
    {
        string path = Glue();
        byte[] original = File.ReadAllBytes(path);
        var image = ElfImage.Parse(original, path);
        var need = image.RequiredFrom("libstdc++.so.6").Single(v => v.Name == "GLIBCXX_3.4.32");
        var bound = image.SymbolsBoundTo(need.Index).Select(s => s.Name).ToList();
        Assert.Equal(new[] { "_ZSt21ios_base_library_initv" }, bound);

        var (patched, edits) = VersionRelaxer.Relax(original, path, "libstdc++.so.6", "GLIBCXX_3.4.32",
            new HashSet<string> { "_ZSt21ios_base_library_initv" });

        Assert.Equal(original.Length, patched.Length);
        var changed = Enumerable.Range(0, original.Length).Where(i => original[i] != patched[i]).ToList();
        var allowed = edits.SelectMany(e => Enumerable.Range(e.Offset, e.Length)).ToHashSet();
        Assert.NotEmpty(changed);
        Assert.All(changed, i => Assert.Contains(i, allowed));
        Assert.Equal(2, edits.Count); // one .gnu.version slot, one Vernaux flags field
        Assert.All(edits, e => Assert.NotEqual(e.Before, e.After));

        var after = ElfImage.Parse(patched, path);
        var relaxed = after.RequiredFrom("libstdc++.so.6").Single(v => v.Name == "GLIBCXX_3.4.32");
        Assert.Equal(ElfImage.VerFlagWeak, relaxed.Flags & ElfImage.VerFlagWeak);
        Assert.Empty(after.SymbolsBoundTo(need.Index));
        // Every other requirement is untouched.
        Assert.Equal(
            image.Needs.SelectMany(n => n.Versions).Where(v => v.Name != "GLIBCXX_3.4.32").Select(v => (v.Name, v.Flags, v.Index)),
            after.Needs.SelectMany(n => n.Versions).Where(v => v.Name != "GLIBCXX_3.4.32").Select(v => (v.Name, v.Flags, v.Index)));
    }

    [Fact]
    public void Relaxed_copy_reads_as_weak_in_binutils_readelf()
    {
        // Outside reference: GNU binutils readelf (Debian 12 binutils 2.40) decodes .gnu.version_r independently
        // of our reader. Without binutils the check returns early, unless KIT_REQUIRE_BINUTILS=1 (set by .ci/run).
        if (!File.Exists("/usr/bin/readelf"))
        {
            Assert.False(Environment.GetEnvironmentVariable("KIT_REQUIRE_BINUTILS") == "1",
                "readelf not found; install Debian's binutils package");
            return;
        }
        string path = Glue();
        var (patched, _) = VersionRelaxer.Relax(File.ReadAllBytes(path), path, "libstdc++.so.6", "GLIBCXX_3.4.32",
            new HashSet<string> { "_ZSt21ios_base_library_initv" });
        string copy = Path.Combine(Path.GetTempPath(), $"kit-relaxed-{Guid.NewGuid():N}.so");
        File.WriteAllBytes(copy, patched);
        try
        {
            string before = Readelf(path), after = Readelf(copy);
            Assert.Contains("Name: GLIBCXX_3.4.32  Flags: none", before);
            Assert.Contains("Name: GLIBCXX_3.4.32  Flags: WEAK", after);
        }
        finally { File.Delete(copy); }
    }

    [Fact]
    public void Relaxing_refuses_when_the_version_binds_symbols_that_are_really_used()
    {
        string path = Glue();
        var ex = Assert.Throws<EngineLoadException>(() => VersionRelaxer.Relax(File.ReadAllBytes(path), path,
            "libstdc++.so.6", "GLIBCXX_3.4.32", new HashSet<string>()));
        Assert.Contains("_ZSt21ios_base_library_initv", ex.Message);
    }

    [Fact]
    public void Parse_rejects_files_that_are_not_64_bit_elf()
    {
        var ex = Assert.Throws<EngineLoadException>(() => ElfImage.Parse(new byte[100], "/tmp/x.so"));
        Assert.Contains("/tmp/x.so: not an ELF file", ex.Message);
        var elf32 = new byte[100]; elf32[0] = 0x7f; elf32[1] = (byte)'E'; elf32[2] = (byte)'L'; elf32[3] = (byte)'F'; elf32[4] = 1;
        Assert.Contains("64-bit", Assert.Throws<EngineLoadException>(() => ElfImage.Parse(elf32, "a.so")).Message);
    }

    [Fact]
    public void Missing_version_message_names_version_distributions_and_remedy()
    {
        string msg = Engine.MissingVersionMessage("/x/libLibTorchSharp.so", "/usr/lib/libstdc++.so.6",
            new[] { "GLIBCXX_3.4.33" }, new[] { "GLIBCXX_3.4.9", "GLIBCXX_3.4.30", "GLIBCXX_3.4.4" });
        Assert.Contains("GLIBCXX_3.4.33", msg);
        Assert.Contains("up to GLIBCXX_3.4.30", msg); // numeric, not string, ordering of versions
        Assert.Contains("Debian 12", msg);
        Assert.Contains("Install a libstdc++", msg);
    }

    [Fact]
    public void Engine_loads_leaves_the_package_untouched_and_a_training_step_runs()
    {
        string glue = Glue();
        string hashBefore = Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(glue)));
        var status = Engine.EnsureLoaded();
        Assert.Equal(hashBefore, Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(glue))));
        if (status.Mode == "relaxed copy")
            Assert.StartsWith(Engine.CacheRoot(), status.NativeLibrary);

        torch.manual_seed(7);
        using var scope = torch.NewDisposeScope();
        var gru = nn.GRU(3, 5, batchFirst: true);
        var head = nn.Linear(5, 2);
        var x = randn(4, 6, 3);
        var y = tensor(new long[] { 0, 1, 0, 1 });
        var parameters = gru.parameters().Concat(head.parameters()).ToList();
        var before = parameters.Select(p => p.detach().clone()).ToList();
        var opt = optim.Adam(parameters, 0.01);
        var (_, h) = gru.forward(x);
        var loss = nn.functional.cross_entropy(head.forward(h[0]), y);
        loss.backward();
        opt.step();
        Assert.True(double.IsFinite(loss.item<float>()));
        Assert.Contains(parameters.Zip(before), p => !p.First.detach().allclose(p.Second));
    }

    static string Readelf(string path)
    {
        var psi = new ProcessStartInfo("/usr/bin/readelf", $"-V \"{path}\"") { RedirectStandardOutput = true };
        using var p = Process.Start(psi)!;
        string output = p.StandardOutput.ReadToEnd();
        p.WaitForExit();
        return output;
    }
}
