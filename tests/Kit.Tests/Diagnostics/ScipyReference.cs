using System.Diagnostics;
using System.Globalization;
using System.Text.Json.Nodes;

namespace Kit.Tests.Diagnostics;

/// <summary>
/// SciPy (Debian's python3-scipy, run by /usr/bin/python3) as an outside reference for the average-linkage
/// clustering: <c>scipy.cluster.hierarchy.linkage(method="average")</c> on the condensed distances and
/// <c>leaves_list</c> of the result. The library's version is read at run time and printed beside the check.
/// </summary>
internal static class ScipyReference
{
    public const string Python = "/usr/bin/python3";
    public const string Variable = "KIT_REQUIRE_SCIPY";
    public const string Install = "apt-get install python3-scipy (Debian; the tests run it with /usr/bin/python3)";

    public static bool Required => Environment.GetEnvironmentVariable(Variable) == "1";

    const string Script = """
        import json, sys
        import numpy as np
        import scipy
        from scipy.cluster.hierarchy import linkage, leaves_list
        from scipy.spatial.distance import squareform
        d = np.array(json.load(open(sys.argv[1])), dtype=float)
        z = linkage(squareform(d, checks=False), method="average")
        print(json.dumps({"version": scipy.__version__, "merges": z.tolist(), "leaves": leaves_list(z).tolist()}))
        """;

    public sealed record Result(string Version, double[][] Merges, int[] Leaves);

    /// <summary>The reference's linkage of <paramref name="distances"/>, or null with the reason when SciPy cannot be run here.</summary>
    public static (Result? Result, string? Problem) Linkage(double[,] distances, string folder)
    {
        if (!File.Exists(Python)) return (null, $"{Python} not found");
        Directory.CreateDirectory(folder);
        int n = distances.GetLength(0);
        var rows = new JsonArray();
        for (int i = 0; i < n; i++) rows.Add(new JsonArray(Enumerable.Range(0, n).Select(j => (JsonNode?)JsonValue.Create(distances[i, j])).ToArray()));
        string input = Path.Combine(folder, "distances.json"), script = Path.Combine(folder, "linkage.py");
        File.WriteAllText(input, rows.ToJsonString());
        File.WriteAllText(script, Script);
        var start = new ProcessStartInfo(Python) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        start.ArgumentList.Add(script);
        start.ArgumentList.Add(input);
        start.Environment["OPENBLAS_NUM_THREADS"] = "1";
        using var p = Process.Start(start)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(120_000)) { p.Kill(entireProcessTree: true); return (null, "python3 did not finish in 120 s"); }
        p.WaitForExit();
        if (p.ExitCode != 0) return (null, $"{Python} cannot run scipy's linkage: {stderr.Result.Trim()}");
        var json = JsonNode.Parse(stdout.Result.Trim().Split('\n')[^1])!;
        return (new Result((string)json["version"]!,
            json["merges"]!.AsArray().Select(r => r!.AsArray().Select(v => v!.GetValue<double>()).ToArray()).ToArray(),
            json["leaves"]!.AsArray().Select(v => v!.GetValue<int>()).ToArray()), null);
    }

    public static string Describe(double[] values) => string.Join(", ", values.Select(v => v.ToString("G6", CultureInfo.InvariantCulture)));
}
