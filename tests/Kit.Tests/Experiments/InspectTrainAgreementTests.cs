using System.Text.Json.Nodes;
using System.Text.RegularExpressions;

namespace Kit.Tests.Experiments;

/// <summary>
/// `kit inspect` and `kit train` prepare data through the same function with the same defaults, so the split a user
/// audits is the split that is trained on: same file, same flags, same part sizes.
/// </summary>
[Collection(Kit.Tests.Training.EngineRandomCollection.Name)]
public sealed class InspectTrainAgreementTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-agree-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    static int[] InspectedParts(string output) =>
        new[] { "train", "validation", "test" }.Select(part =>
            int.Parse(Regex.Match(output, $@"^\s+{part}\s+(\d+)\s", RegexOptions.Multiline).Groups[1].Value)).ToArray();

    [Fact]
    public void Inspect_and_train_report_the_same_part_sizes_on_the_demo_file_with_a_group_column()
    {
        string[] flags = ["--group", "group"];
        var (code, output, err) = KitCli.Run(["inspect", KitCli.DemoHostnames, .. flags]);
        Assert.True(code == 0, err);
        int[] inspected = InspectedParts(output);
        Assert.Equal(19_840, inspected.Sum());
        Assert.Contains("Split: group holdout 0.7/0.15/0.15, seed 17", output);

        string outDir = Path.Combine(_dir, "train");
        (code, _, err) = KitCli.Run(["train", KitCli.DemoHostnames, .. flags, "--epochs", "1", "--embed", "4", "--hidden", "8", "--batch", "256",
            "--max-length", "24", "--out", outDir], timeoutSeconds: 600);
        Assert.True(code == 0, err);
        var split = JsonNode.Parse(File.ReadAllText(Path.Combine(outDir, "metrics.json")))!["data"]!["split"]!;
        Assert.Equal(inspected, new[] { (int)split["train"]!, (int)split["validation"]!, (int)split["test"]! });
        Assert.Contains($"train {inspected[0]}, validation {inspected[1]}, test {inspected[2]}", err);

        // A sample flag shapes both the same way.
        (code, output, err) = KitCli.Run(["inspect", KitCli.DemoHostnames, .. flags, "--sample", "2000", "--holdout", "0.8/0.1/0.1"]);
        Assert.True(code == 0, err);
        Assert.InRange(InspectedParts(output).Sum(), 1990, 2010);
    }
}
