using System.Diagnostics;
using System.Security.Cryptography;
using System.Text;
using System.Text.RegularExpressions;

namespace Kit.Tools.Notebooks;

/// <summary>
/// The folder package feed that notebooks reference with <c>#i "nuget: ..."</c>: Kit and Kit.Notebooks packed
/// from this source tree. Packing is skipped when the sources have not changed since the last pack (a hash of
/// them is kept beside the packages). Because the version stays 0.1.0, NuGet would keep using whichever copy it
/// extracted first into its global packages folder (another worktree's, or last week's), so a copy there whose
/// checksum differs from the feed's package is removed and gets extracted again from the feed.
/// </summary>
public static partial class LocalFeed
{
    static readonly string[] Projects = { "src/Kit/Kit.csproj", "src/Kit.Notebooks/Kit.Notebooks.csproj" };
    static readonly string[] SourceRoots = { "src/Kit", "src/Kit.Notebooks" };
    static readonly string[] SharedFiles = { "Directory.Build.props", "Directory.Packages.props" };
    static readonly string[] PackageIds = { "Kit", "Kit.Notebooks" };
    const string StampFile = ".kit-sources.sha256";
    static readonly object Gate = new();

    public static string DefaultFolder(string repoRoot) => Path.Combine(repoRoot, "artifacts", "feed");

    /// <summary>The repository root above <paramref name="start"/> (the folder holding Kit.sln).</summary>
    public static string FindRepoRoot(string start)
    {
        for (var dir = new DirectoryInfo(Path.GetFullPath(start)); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "Kit.sln"))) return dir.FullName;
        throw new DirectoryNotFoundException($"No Kit.sln in {start} or any folder above it.");
    }

    /// <summary>Packs into <paramref name="feed"/> unless it already holds packages of the current sources.</summary>
    public static string Ensure(string repoRoot, string? feed = null, TextWriter? log = null)
    {
        feed = Path.GetFullPath(feed ?? DefaultFolder(repoRoot));
        lock (Gate)
        {
            string hash = SourceHash(repoRoot);
            string stamp = Path.Combine(feed, StampFile);
            string version = PackageVersion(repoRoot);
            bool present = PackageIds.All(id => File.Exists(Path.Combine(feed, $"{id}.{version}.nupkg")));
            if (!present || !File.Exists(stamp) || File.ReadAllText(stamp).Trim() != hash)
            {
                Directory.CreateDirectory(feed);
                foreach (var project in Projects)
                    Pack(repoRoot, Path.Combine(repoRoot, project), feed, log);
                File.WriteAllText(stamp, hash);
            }
            foreach (var id in PackageIds)
                EvictIfDifferent(Path.Combine(feed, $"{id}.{version}.nupkg"), Path.Combine(NuGetPackagesFolder(), id.ToLowerInvariant(), version), log);
            return feed;
        }
    }

    /// <summary>NuGet keeps the base64 SHA-512 of the package it extracted in &lt;id&gt;.&lt;version&gt;.nupkg.sha512.</summary>
    internal static void EvictIfDifferent(string package, string extracted, TextWriter? log)
    {
        if (!Directory.Exists(extracted)) return;
        string expected = Convert.ToBase64String(SHA512.HashData(File.ReadAllBytes(package)));
        string? recorded = Directory.EnumerateFiles(extracted, "*.nupkg.sha512").Select(f => File.ReadAllText(f).Trim()).FirstOrDefault();
        if (recorded == expected) return;
        log?.WriteLine($"removing {extracted}: it is not the package in the feed");
        Directory.Delete(extracted, recursive: true);
    }

    static void Pack(string repoRoot, string project, string feed, TextWriter? log)
    {
        var start = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = repoRoot,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var a in new[] { "pack", project, "-c", "Release", "-o", feed, "--nologo", "-v", "quiet", "-nodeReuse:false" })
            start.ArgumentList.Add(a);
        log?.WriteLine($"packing {Path.GetFileName(project)} into {feed}");
        using var process = Process.Start(start) ?? throw new InvalidOperationException("could not start dotnet");
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        process.WaitForExit();
        if (process.ExitCode != 0)
            throw new InvalidOperationException($"dotnet pack {project} failed ({process.ExitCode}):\n{stdout.Result}\n{stderr.Result}");
    }

    internal static string SourceHash(string repoRoot)
    {
        var files = SourceRoots
            .SelectMany(r => Directory.EnumerateFiles(Path.Combine(repoRoot, r), "*", SearchOption.AllDirectories))
            .Where(f => !Regex.IsMatch(Path.GetRelativePath(repoRoot, f).Replace('\\', '/'), @"(^|/)(bin|obj)/"))
            .Concat(SharedFiles.Select(f => Path.Combine(repoRoot, f)).Where(File.Exists))
            .Select(f => Path.GetRelativePath(repoRoot, f).Replace('\\', '/'))
            .OrderBy(f => f, StringComparer.Ordinal);
        using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        foreach (var rel in files)
        {
            sha.AppendData(Encoding.UTF8.GetBytes(rel + "\n"));
            sha.AppendData(File.ReadAllBytes(Path.Combine(repoRoot, rel)));
        }
        return Convert.ToHexString(sha.GetHashAndReset()).ToLowerInvariant();
    }

    /// <summary>The version both packages carry (the &lt;Version&gt; of Kit.Notebooks.csproj).</summary>
    public static string PackageVersion(string repoRoot)
    {
        string csproj = File.ReadAllText(Path.Combine(repoRoot, Projects[1]));
        var m = VersionPattern().Match(csproj);
        return m.Success ? m.Groups[1].Value : throw new InvalidOperationException($"{Projects[1]} has no <Version>.");
    }

    static string NuGetPackagesFolder() =>
        Environment.GetEnvironmentVariable("NUGET_PACKAGES") is { Length: > 0 } p
            ? p
            : Path.Combine(Environment.GetFolderPath(Environment.SpecialFolder.UserProfile), ".nuget", "packages");

    [GeneratedRegex(@"<Version>\s*([^<\s]+)\s*</Version>")] private static partial Regex VersionPattern();
}
