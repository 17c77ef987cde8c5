using System.Text;
using System.Text.Json;
using PuppeteerSharp;
using PuppeteerSharp.Media;

namespace Kit.Export;

/// <summary>How many charts a page promised, drew and failed, read from the rendered page itself.</summary>
public sealed record ChartCensus(int Expected, int Drawn, int WithSvg, int MainSvgs, int FooterCount, IReadOnlyList<string> Errors)
{
    public bool AllDrawn => Expected == Drawn && Expected == WithSvg && Errors.Count == 0;
}

/// <summary>A report or chart page open in <see cref="HeadlessBrowser"/>: census, screenshot, PDF and per-chart images.</summary>
public sealed class BrowserPage : IAsyncDisposable
{
    readonly IPage _page;
    readonly List<string> _consoleErrors = new();

    internal BrowserPage(IPage page)
    {
        _page = page;
        _page.Console += (_, e) => { if (e.Message.Type == ConsoleType.Error) lock (_consoleErrors) _consoleErrors.Add(e.Message.Text); };
        _page.PageError += (_, e) => { lock (_consoleErrors) _consoleErrors.Add(e.Message); };
    }

    /// <summary>Script errors and console errors seen since the page opened.</summary>
    public IReadOnlyList<string> ConsoleErrors { get { lock (_consoleErrors) return _consoleErrors.ToArray(); } }

    internal async Task LoadAsync(string url, TimeSpan timeout)
    {
        int ms = (int)timeout.TotalMilliseconds;
        await _page.GoToAsync(url, new NavigationOptions { WaitUntil = new[] { WaitUntilNavigation.Load }, Timeout = ms }).ConfigureAwait(false);
        await _page.WaitForFunctionAsync(
            "() => Array.from(document.querySelectorAll('[data-kit-chart]')).every(c => c.hasAttribute('data-kit-drawn') || c.hasAttribute('data-kit-error'))",
            new WaitForFunctionOptions { Timeout = ms, PollingInterval = 100 }).ConfigureAwait(false);
    }

    public async Task<ChartCensus> CensusAsync()
    {
        const string script = """
            () => {
              const charts = Array.from(document.querySelectorAll('[data-kit-chart]'));
              const footer = document.querySelector('[data-kit-charts]');
              return JSON.stringify({
                expected: charts.length,
                drawn: charts.filter(c => c.getAttribute('data-kit-drawn') === '1').length,
                withSvg: charts.filter(c => c.querySelector('svg.main-svg') !== null).length,
                mainSvgs: document.querySelectorAll('svg.main-svg').length,
                footer: footer ? Number(footer.getAttribute('data-kit-charts')) : -1,
                errors: charts.map(c => c.getAttribute('data-kit-error')).filter(e => e)
              });
            }
            """;
        string json = await _page.EvaluateFunctionAsync<string>(script).ConfigureAwait(false);
        using var doc = JsonDocument.Parse(json);
        var r = doc.RootElement;
        return new ChartCensus(r.GetProperty("expected").GetInt32(), r.GetProperty("drawn").GetInt32(), r.GetProperty("withSvg").GetInt32(),
            r.GetProperty("mainSvgs").GetInt32(), r.GetProperty("footer").GetInt32(),
            r.GetProperty("errors").EnumerateArray().Select(e => e.GetString() ?? "").ToArray());
    }

    /// <summary>Every chart's text boxes as laid out on screen (tick labels, titles, annotations, legend); see <see cref="ChartLayout.Problems"/>.</summary>
    internal async Task<IReadOnlyList<ChartLayout>> LayoutAsync()
    {
        string json = await _page.EvaluateFunctionAsync<string>(ChartLayout.Script).ConfigureAwait(false);
        using var doc = JsonDocument.Parse(json);
        static TextBox Box(JsonElement e) => new(e[0].GetDouble(), e[1].GetDouble(), e[2].GetDouble(), e[3].GetDouble());
        static TextQuad Quad(JsonElement e) => new(e[0].GetDouble(), e[1].GetDouble(), e[2].GetDouble(), e[3].GetDouble(),
            e[4].GetDouble(), e[5].GetDouble(), e[6].GetDouble(), e[7].GetDouble());
        static ChartText[] Texts(JsonElement list) => list.EnumerateArray()
            .Select(t => new ChartText(t.GetProperty("kind").GetString()!, t.GetProperty("group").GetString()!, t.GetProperty("text").GetString()!,
                Quad(t.GetProperty("quad")), t.GetProperty("font").GetDouble()))
            .ToArray();
        return doc.RootElement.EnumerateArray()
            .Select(c => new ChartLayout(c.GetProperty("index").GetInt32(), c.GetProperty("name").GetString()!, Box(c.GetProperty("frame")),
                Texts(c.GetProperty("ticks")), Texts(c.GetProperty("labels"))))
            .ToArray();
    }

    /// <summary>Text of every element matching a CSS selector (e.g. tick labels), as the browser shows it.</summary>
    public async Task<string[]> TextsAsync(string selector) =>
        await _page.EvaluateFunctionAsync<string[]>("s => Array.from(document.querySelectorAll(s)).map(e => e.textContent)", selector).ConfigureAwait(false);

    public Task ScreenshotAsync(string path, bool fullPage = true) =>
        _page.ScreenshotAsync(path, new ScreenshotOptions { FullPage = fullPage, Type = ScreenshotType.Png });

    /// <summary>The page as printed (A4, backgrounds kept), the way a reader would save it to PDF.</summary>
    public Task PdfAsync(string path) =>
        _page.PdfAsync(path, new PdfOptions { Format = PaperFormat.A4, PrintBackground = true, MarginOptions = new MarginOptions { Top = "12mm", Bottom = "12mm", Left = "10mm", Right = "10mm" } });

    /// <summary>Chart <paramref name="index"/> (page order) as SVG text or PNG bytes, drawn by plotly.js at its on-page size.</summary>
    public async Task<byte[]> ChartImageAsync(int index, ChartImageFormat format, int scale = 2)
    {
        const string script = """
            async (i, fmt, scale) => {
              const el = document.querySelectorAll('[data-kit-chart]')[i];
              if (!el) throw new Error('no chart ' + i);
              const w = el._fullLayout.width, h = el._fullLayout.height;
              return await Plotly.toImage(el, { format: fmt, width: w, height: h, scale: fmt === 'svg' ? 1 : scale });
            }
            """;
        string url = await _page.EvaluateFunctionAsync<string>(script, index, format == ChartImageFormat.Svg ? "svg" : "png", scale).ConfigureAwait(false);
        return DecodeDataUrl(url);
    }

    /// <summary>Bytes of a data: URL (base64 or percent-encoded).</summary>
    internal static byte[] DecodeDataUrl(string url)
    {
        int comma = url.IndexOf(',');
        if (!url.StartsWith("data:", StringComparison.Ordinal) || comma < 0)
            throw new InvalidOperationException($"plotly.js returned something that is not a data URL: {url[..Math.Min(40, url.Length)]}…");
        string header = url[..comma], body = url[(comma + 1)..];
        return header.EndsWith(";base64", StringComparison.Ordinal) ? Convert.FromBase64String(body) : Encoding.UTF8.GetBytes(Uri.UnescapeDataString(body));
    }

    public async ValueTask DisposeAsync() => await _page.CloseAsync().ConfigureAwait(false);
}
