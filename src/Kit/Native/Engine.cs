using System.Reflection;
using System.Runtime.InteropServices;
using System.Security.Cryptography;
using Kit.Common;

namespace Kit.Native;

/// <summary>What <see cref="Engine.EnsureLoaded"/> did, for logs and for the notebook banner.</summary>
public sealed record EngineStatus(string Mode, string? NativeLibrary, string? CppRuntime, IReadOnlyList<string> Notes)
{
    public override string ToString() =>
        $"engine: {Mode}" + (NativeLibrary is null ? "" : $" ({NativeLibrary})") +
        (Notes.Count == 0 ? "" : "; " + string.Join("; ", Notes));
}

public sealed class EngineLoadException(string message) : Exception(message);

/// <summary>
/// Makes the TorchSharp native glue load on this machine before anything touches TorchSharp.
/// Every entry point that uses the engine (CLI, notebooks, tests, bench) calls <see cref="EnsureLoaded"/> first.
///
/// TorchSharp 0.107's libLibTorchSharp.so is linked with GCC 13 and so asks libstdc++ for GLIBCXX_3.4.32, only
/// to reference std::ios_base_library_init, which it never calls (libtorch initialises the streams itself).
/// On distributions with an older C++ runtime (Debian 12 has 3.4.30) the loader refuses the file. When that is
/// the only gap, the kit writes a relaxed copy into its own cache folder (the NuGet cache is never edited),
/// links the engine's other libraries beside it so that $ORIGIN lookups still work, and loads that copy.
/// </summary>
public static class Engine
{
    const string GlueFile = "libLibTorchSharp.so";
    const string CppRuntime = "libstdc++.so.6";

    /// <summary>Versions the kit knows how to do without, and the only symbols they may bind.</summary>
    static readonly Dictionary<string, HashSet<string>> Relaxable = new()
    {
        ["GLIBCXX_3.4.32"] = new() { "_ZSt21ios_base_library_initv" },
    };

    static readonly object Gate = new();
    static EngineStatus? _status;
    static IntPtr _handle;

    public static EngineStatus EnsureLoaded()
    {
        lock (Gate)
        {
            if (_status is not null) return _status;
            _status = Load();
            return _status;
        }
    }

    static EngineStatus Load()
    {
        if (!OperatingSystem.IsLinux())
            return new EngineStatus("as shipped", null, null, new[] { "not Linux: TorchSharp loads its own libraries" });

        var torchAssembly = typeof(TorchSharp.torch).Assembly;
        var glue = FindGlue(torchAssembly)
            ?? throw new EngineLoadException(
                $"Could not find {GlueFile} near {torchAssembly.Location} or in the NuGet cache. " +
                "Reference the TorchSharp-cpu package (it brings the native engine) and restore.");
        var runtime = FindCppRuntime()
            ?? throw new EngineLoadException($"Could not find the system C++ runtime {CppRuntime}. Install the libstdc++6 package.");

        var glueImage = ElfImage.Read(glue);
        var defined = ElfImage.Read(runtime).DefinedVersions.ToHashSet();
        var missing = glueImage.RequiredFrom(CppRuntime).Select(v => v.Name).Where(v => !defined.Contains(v)).Distinct().ToList();
        if (missing.Count == 0)
            return new EngineStatus("as shipped", glue, runtime, Array.Empty<string>());

        var notRelaxable = missing.Where(m => !Relaxable.ContainsKey(m)).ToList();
        if (notRelaxable.Count > 0)
            throw new EngineLoadException(MissingVersionMessage(glue, runtime, missing, defined));

        var libtorchDir = FindLibtorchDir(torchAssembly, Path.GetDirectoryName(glue)!)
            ?? throw new EngineLoadException(
                $"Found {glue} but not libtorch_cpu.so. Reference the TorchSharp-cpu package (it brings libtorch-cpu) and restore.");

        string relaxed = WriteRelaxedCopy(glue, libtorchDir, missing);
        try
        {
            _handle = NativeLibrary.Load(relaxed);
        }
        catch (DllNotFoundException e)
        {
            throw new EngineLoadException($"The relaxed copy {relaxed} still did not load: {e.Message}. " +
                                          MissingVersionMessage(glue, runtime, missing, defined));
        }
        RouteImports(torchAssembly);
        return new EngineStatus("relaxed copy", relaxed, runtime,
            new[] { $"{Path.GetFileName(runtime)} lacks {string.Join(", ", missing)}; loaded a copy with that requirement marked weak" });
    }

    static void RouteImports(Assembly torchAssembly)
    {
        // The copy is already in the process; make TorchSharp's P/Invokes bind to it rather than probing for the
        // shipped file, which would be a different inode and would fail again.
        try
        {
            NativeLibrary.SetDllImportResolver(torchAssembly, (name, _, _) =>
                name is "LibTorchSharp" or "libLibTorchSharp" or GlueFile ? _handle : IntPtr.Zero);
        }
        catch (InvalidOperationException)
        {
            // A resolver is already set (TorchSharp or a host did it); dlopen by soname then finds our copy.
        }
    }

    internal static string MissingVersionMessage(string glue, string runtime, IEnumerable<string> missing, IEnumerable<string> defined)
    {
        string newest = defined.Where(d => d.StartsWith("GLIBCXX_", StringComparison.Ordinal))
            .OrderBy(d => d, VersionNameComparer.Instance).LastOrDefault() ?? "none";
        return $"{glue} needs {string.Join(", ", missing)} from {CppRuntime}, but {runtime} provides versions up to {newest}. " +
               "This affects distributions whose C++ runtime predates GCC 13 (for example Debian 12 and Ubuntu 22.04). " +
               "Install a libstdc++ from GCC 13 or newer, or run on a newer distribution (Debian 13, Ubuntu 24.04 or later).";
    }

    static string WriteRelaxedCopy(string glue, string libtorchDir, IReadOnlyList<string> missing)
    {
        byte[] original = File.ReadAllBytes(glue);
        string key = Convert.ToHexString(SHA256.HashData(original))[..16].ToLowerInvariant() + "-" +
                     Convert.ToHexString(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(libtorchDir)))[..8].ToLowerInvariant();
        string dir = Path.Combine(CacheRoot(), "engine", key);
        Directory.CreateDirectory(dir);

        byte[] patched = original;
        foreach (var version in missing)
            patched = VersionRelaxer.Relax(patched, glue, CppRuntime, version, Relaxable[version]).Patched;

        string target = Path.Combine(dir, GlueFile);
        if (!File.Exists(target) || !File.ReadAllBytes(target).AsSpan().SequenceEqual(patched))
            AtomicFile.WriteAllBytes(target, patched);

        foreach (var source in Directory.EnumerateFiles(libtorchDir))
        {
            string name = Path.GetFileName(source);
            if (name == GlueFile || !name.Contains(".so")) continue;
            LinkInto(dir, name, source);
        }
        return target;
    }

    static void LinkInto(string dir, string name, string source)
    {
        string link = Path.Combine(dir, name);
        var existing = new FileInfo(link);
        if (existing.LinkTarget == source) return;
        string temp = Path.Combine(dir, $".{name}.{Environment.ProcessId}.{Guid.NewGuid():N}");
        File.CreateSymbolicLink(temp, source);
        File.Move(temp, link, overwrite: true);
    }

    /// <summary>$KIT_CACHE_DIR, else $XDG_CACHE_HOME/kit, else ~/.cache/kit.</summary>
    internal static string CacheRoot()
    {
        string? explicitDir = Environment.GetEnvironmentVariable("KIT_CACHE_DIR");
        if (!string.IsNullOrEmpty(explicitDir)) return explicitDir;
        string? xdg = Environment.GetEnvironmentVariable("XDG_CACHE_HOME");
        if (!string.IsNullOrEmpty(xdg)) return Path.Combine(xdg, "kit");
        return Path.Combine(Environment.GetFolderPath(Environment.SpecialFolder.UserProfile), ".cache", "kit");
    }

    static IEnumerable<string> NativeDirs(Assembly torchAssembly)
    {
        if (AppContext.GetData("NATIVE_DLL_SEARCH_DIRECTORIES") is string dirs)
            foreach (var d in dirs.Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries))
                yield return d;
        string? asmDir = Path.GetDirectoryName(torchAssembly.Location);
        if (!string.IsNullOrEmpty(asmDir))
        {
            yield return asmDir;
            yield return Path.Combine(asmDir, "runtimes", "linux-x64", "native");
            // Inside the NuGet cache: torchsharp/<v>/lib/<tfm>/TorchSharp.dll -> torchsharp/<v>/runtimes/...
            yield return Path.GetFullPath(Path.Combine(asmDir, "..", "..", "runtimes", "linux-x64", "native"));
        }
        yield return AppContext.BaseDirectory;
        yield return Path.Combine(AppContext.BaseDirectory, "runtimes", "linux-x64", "native");
    }

    internal static string? FindGlue(Assembly torchAssembly)
    {
        foreach (var d in NativeDirs(torchAssembly))
        {
            string p = Path.Combine(d, GlueFile);
            if (File.Exists(p)) return Path.GetFullPath(p);
        }
        string version = torchAssembly.GetName().Version is { } v ? $"{v.Major}.{v.Minor}.{v.Build}" : "0.107.0";
        string fromCache = Path.Combine(NuGetRoot(), "torchsharp", version, "runtimes", "linux-x64", "native", GlueFile);
        return File.Exists(fromCache) ? fromCache : null;
    }

    internal static string? FindLibtorchDir(Assembly torchAssembly, string glueDir)
    {
        foreach (var d in NativeDirs(torchAssembly).Prepend(glueDir))
            if (File.Exists(Path.Combine(d, "libtorch_cpu.so"))) return Path.GetFullPath(d);

        // In a notebook kernel the glue and libtorch sit in different package folders of the NuGet cache.
        string pkg = Path.Combine(NuGetRoot(), "libtorch-cpu-linux-x64");
        if (!Directory.Exists(pkg)) return null;
        return Directory.EnumerateDirectories(pkg)
            .OrderByDescending(d => d, StringComparer.Ordinal)
            .Select(d => Path.Combine(d, "runtimes", "linux-x64", "native"))
            .FirstOrDefault(d => File.Exists(Path.Combine(d, "libtorch_cpu.so")));
    }

    static string NuGetRoot() =>
        Environment.GetEnvironmentVariable("NUGET_PACKAGES") is { Length: > 0 } p
            ? p
            : Path.Combine(Environment.GetFolderPath(Environment.SpecialFolder.UserProfile), ".nuget", "packages");

    /// <summary>The libstdc++ this process uses (from /proc/self/maps), else the first in the usual places.</summary>
    internal static string? FindCppRuntime()
    {
        try
        {
            foreach (var line in File.ReadLines("/proc/self/maps"))
            {
                int slash = line.IndexOf('/');
                if (slash >= 0 && line.EndsWith("/" + CppRuntime, StringComparison.Ordinal))
                    return line[slash..];
            }
        }
        catch (IOException) { }
        catch (UnauthorizedAccessException) { }
        string[] dirs = { "/usr/lib/x86_64-linux-gnu", "/lib/x86_64-linux-gnu", "/usr/lib64", "/lib64", "/usr/lib", "/lib" };
        return dirs.Select(d => Path.Combine(d, CppRuntime)).FirstOrDefault(File.Exists);
    }

    sealed class VersionNameComparer : IComparer<string>
    {
        public static readonly VersionNameComparer Instance = new();
        public int Compare(string? x, string? y)
        {
            var a = Parts(x); var b = Parts(y);
            for (int i = 0; i < Math.Max(a.Length, b.Length); i++)
            {
                int c = (i < a.Length ? a[i] : 0).CompareTo(i < b.Length ? b[i] : 0);
                if (c != 0) return c;
            }
            return 0;
        }
        static int[] Parts(string? s) =>
            (s ?? "").Split('_').Last().Split('.').Select(p => int.TryParse(p, out var n) ? n : 0).ToArray();
    }
}
