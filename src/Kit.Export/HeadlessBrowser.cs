using PuppeteerSharp;

namespace Kit.Export;

/// <summary>
/// A locally installed Chromium driven headless, for chart images, report screenshots and PDFs. Nothing is
/// downloaded: the browser must already be on the machine (Debian: <c>apt-get install chromium</c>), found
/// through KIT_CHROMIUM or the usual install paths. Each launch gets a fresh profile folder, deleted on dispose.
/// </summary>
public sealed class HeadlessBrowser : IAsyncDisposable
{
    /// <summary>Environment variable that names the browser executable, ahead of the usual paths.</summary>
    public const string PathVariable = "KIT_CHROMIUM";

    static readonly string[] Candidates =
    {
        "/usr/bin/chromium", "/usr/bin/chromium-browser", "/usr/lib/chromium/chromium", "/snap/bin/chromium",
        "/usr/bin/google-chrome", "/usr/bin/google-chrome-stable", "/opt/google/chrome/chrome",
        "/Applications/Chromium.app/Contents/MacOS/Chromium", "/Applications/Google Chrome.app/Contents/MacOS/Google Chrome",
        @"C:\Program Files\Google\Chrome\Application\chrome.exe", @"C:\Program Files (x86)\Google\Chrome\Application\chrome.exe",
    };

    /// <summary>Flags for a quiet, self-contained run: no sandbox (containers), no GPU, no background traffic.</summary>
    public static readonly IReadOnlyList<string> Flags = new[]
    {
        "--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking",
        "--disable-component-update", "--disable-sync",
    };

    public static string NotFoundMessage =>
        $"no Chromium found (looked at ${PathVariable} and {string.Join(", ", Candidates.Take(6))}); install one (Debian: apt-get install chromium) " +
        $"or set {PathVariable} to its executable. HTML is written either way; SVG, PNG and PDF need the browser.";

    readonly IBrowser _browser;
    readonly string _profile;

    public string ExecutablePath { get; }

    HeadlessBrowser(IBrowser browser, string executable, string profile)
    {
        _browser = browser;
        ExecutablePath = executable;
        _profile = profile;
    }

    /// <summary>The browser executable to use, or null when none is installed.</summary>
    public static string? Locate()
    {
        string? named = Environment.GetEnvironmentVariable(PathVariable);
        if (!string.IsNullOrWhiteSpace(named)) return File.Exists(named) ? named : null;
        return Candidates.FirstOrDefault(File.Exists);
    }

    /// <summary>Starts the browser; throws <see cref="FileNotFoundException"/> with <see cref="NotFoundMessage"/> when there is none.</summary>
    public static async Task<HeadlessBrowser> LaunchAsync(string? executable = null, CancellationToken cancel = default)
    {
        executable ??= Locate() ?? throw new FileNotFoundException(NotFoundMessage);
        if (!File.Exists(executable)) throw new FileNotFoundException($"browser executable {executable} does not exist. {NotFoundMessage}", executable);
        cancel.ThrowIfCancellationRequested();
        string profile = Directory.CreateTempSubdirectory("kit-chromium-").FullName;
        try
        {
            var browser = await Puppeteer.LaunchAsync(new LaunchOptions
            {
                Headless = true,
                ExecutablePath = executable,
                Browser = SupportedBrowser.Chromium,
                UserDataDir = profile,
                Args = Flags.ToArray(),
                Timeout = 90_000,
            }).ConfigureAwait(false);
            return new HeadlessBrowser(browser, executable, profile);
        }
        catch
        {
            TryDelete(profile);
            throw;
        }
    }

    /// <summary>Opens an HTML file and waits until every chart on it has drawn (or failed).</summary>
    public async Task<BrowserPage> OpenAsync(string htmlPath, int width = 1100, int height = 900, TimeSpan? timeout = null)
    {
        var page = await _browser.NewPageAsync().ConfigureAwait(false);
        await page.SetViewportAsync(new ViewPortOptions { Width = width, Height = height }).ConfigureAwait(false);
        var result = new BrowserPage(page);
        await result.LoadAsync(new Uri(Path.GetFullPath(htmlPath)).AbsoluteUri, timeout ?? TimeSpan.FromSeconds(120)).ConfigureAwait(false);
        return result;
    }

    public async ValueTask DisposeAsync()
    {
        try { await _browser.CloseAsync().ConfigureAwait(false); }
        finally
        {
            await _browser.DisposeAsync().ConfigureAwait(false);
            TryDelete(_profile);
        }
    }

    static void TryDelete(string folder)
    {
        // The browser may still hold a lock file for a moment after exit; a leftover temp folder is harmless.
        try { Directory.Delete(folder, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }
}
