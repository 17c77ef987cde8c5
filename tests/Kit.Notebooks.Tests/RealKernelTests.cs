using System.Text.RegularExpressions;
using Kit.Views;

namespace Kit.Notebooks.Tests;

/// <summary>The packed kit in the real notebook kernel, not the embedded one the runner uses.</summary>
[Collection(FeedCollection.Name)]
public class RealKernelTests(FeedFixture feed)
{
    static readonly TimeSpan Limit = TimeSpan.FromMinutes(4);

    [Fact]
    public async Task The_packed_kit_loads_computes_formats_and_sends_plotly_once_in_the_real_kernel()
    {
        using var kernel = StdioKernel.Start();
        string version = LocalFeed.PackageVersion(feed.RepoRoot);

        var load = await kernel.SubmitAsync($"#i \"nuget: {feed.Feed}\"\n#r \"nuget: Kit.Notebooks, {version}\"", Limit);
        Assert.True(load.Succeeded, load.Error);
        var banner = Assert.Single(load.Outputs, o => o.Value.Contains("kit-loaded"));
        Assert.Contains("engine: ", banner.Value);
        Assert.DoesNotContain("engine not loaded", banner.Value);

        var sum = await kernel.SubmitAsync("TorchSharp.torch.arange(5).sum().item<long>()", Limit);
        Assert.True(sum.Succeeded, sum.Error);
        // 0 + 1 + 2 + 3 + 4
        // In stdio mode the kernel formats plain values as HTML only.
        Assert.Contains(sum.Outputs, o => o.EventType == "ReturnValueProduced" && o.Value.Contains("<pre>10</pre>"));

        var view = await kernel.SubmitAsync("new Kit.Views.TextView(\"Real\", \"<i data-probe=\\\"real\\\">ok</i>\")", Limit);
        Assert.True(view.Succeeded, view.Error);
        Assert.Contains(view.Outputs, o => o.MimeType == "text/html" && o.Value.Contains("<i data-probe=\"real\">ok</i>") && o.Value.Contains("<h2>Real</h2>"));

        string chart = "new Kit.Views.ChartView(\"{0}\", new System.Text.Json.Nodes.JsonArray(), Kit.Views.Theme.Layout(\"{0}\", \"x\", \"y\"))";
        var first = await kernel.SubmitAsync(string.Format(chart, "First"), Limit);
        var second = await kernel.SubmitAsync(string.Format(chart, "Second"), Limit);
        Assert.True(first.Succeeded && second.Succeeded, first.Error ?? second.Error);
        int bundles = first.Outputs.Concat(second.Outputs).Sum(o => Regex.Matches(o.Value, PlotlyAsset.Marker).Count);
        Assert.Equal(1, bundles);
        Assert.Contains(first.Outputs, o => o.Value.Contains(PlotlyAsset.Marker));

        var live = await kernel.SubmitAsync(
            "var live = Kit.Notebooks.LiveProgress.Start(\"Real run\");\n" +
            "for (int e = 1; e <= 2; e++) for (int b = 1; b <= 3; b++) live.Report(new Kit.Notebooks.ProgressSnapshot(e, 2, b, 3, 1.0 / (e + b)));", Limit);
        Assert.True(live.Succeeded, live.Error);
        Assert.Single(live.Outputs, o => o.EventType == "DisplayedValueProduced" && o.Value.Contains("kit-live"));
        Assert.Contains(live.Outputs, o => o.EventType == "DisplayedValueUpdated" && o.Value.Contains("data-kit-epoch=\"2\"") && o.Value.Contains("· done"));
    }
}
