using System.Diagnostics;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using Kit.Experiments;

namespace Kit.Tests.Experiments;

/// <summary>
/// The general-purpose Python ML library scikit-learn as an outside reference for the n-gram baselines: Debian's
/// python3-sklearn run by /usr/bin/python3. It is given the same split, as the kit's own tokens joined back into
/// text (characters with nothing between them, words with single spaces), so both read the same units: character
/// mode uses its "char_wb" analyzer (n-grams inside space-marked words) for 1–5-grams, word mode splits on spaces
/// for 1–2-grams; tf-idf with sublinear tf into LogisticRegression (C = 1, lbfgs, multinomial), and MultinomialNB
/// with the kit's default smoothing on the same tf-idf rows. The library's version is read at run time and printed.
/// </summary>
internal static class ReferenceLibrary
{
    public const string Python = "/usr/bin/python3";
    public const string Variable = "KIT_REQUIRE_SKLEARN";
    public const string Install = "apt-get install python3-sklearn (Debian; the tests run it with /usr/bin/python3)";

    public static bool Required => Environment.GetEnvironmentVariable(Variable) == "1";

    /// <summary>The library's version, or null with the reason when it cannot be run here.</summary>
    public static (string? Version, string? Problem) Probe()
    {
        if (!File.Exists(Python)) return (null, $"{Python} not found");
        var (code, output, error) = Run(["-c", "import sklearn; print(sklearn.__version__)"], 60);
        return code == 0 ? (output.Trim(), null) : (null, $"{Python} cannot import sklearn: {error.Trim()}");
    }

    const string Script = """
        import json, sys, time
        import sklearn
        from sklearn.feature_extraction.text import TfidfVectorizer
        from sklearn.linear_model import LogisticRegression
        from sklearn.naive_bayes import MultinomialNB

        folder, unit, alpha = sys.argv[1], sys.argv[2], float(sys.argv[3])
        def read(name):
            rows = [json.loads(l) for l in open(folder + "/" + name, encoding="utf-8")]
            return [r["text"] for r in rows], [r["label"] for r in rows]
        xtr, ytr = read("train.jsonl")
        xte, yte = read("test.jsonl")
        if unit == "character":
            vectorizer = TfidfVectorizer(analyzer="char_wb", ngram_range=(1, 5), lowercase=False, sublinear_tf=True)
        else:
            vectorizer = TfidfVectorizer(analyzer="word", ngram_range=(1, 2), lowercase=False, token_pattern=r"\S+", sublinear_tf=True)
        a = vectorizer.fit_transform(xtr)
        b = vectorizer.transform(xte)
        started = time.time()
        lr = LogisticRegression(C=1.0, max_iter=2000).fit(a, ytr)
        lr_seconds = time.time() - started
        nb = MultinomialNB(alpha=alpha).fit(a, ytr)
        print(json.dumps({
            "version": sklearn.__version__, "features": a.shape[1], "lr_seconds": lr_seconds,
            "logistic_regression": float((lr.predict(b) == yte).mean()),
            "naive_bayes": float((nb.predict(b) == yte).mean()),
        }))
        """;

    public sealed record Figures(string Version, int Features, double LogisticRegression, double NaiveBayes, double LogisticRegressionSeconds);

    /// <summary>Writes the split and runs the reference on it.</summary>
    public static Figures Score(string folder, NgramUnit unit, IEnumerable<(string Text, int Label)> train, IEnumerable<(string Text, int Label)> test, double smoothing)
    {
        Directory.CreateDirectory(folder);
        Write(Path.Combine(folder, "train.jsonl"), train);
        Write(Path.Combine(folder, "test.jsonl"), test);
        string script = Path.Combine(folder, "reference.py");
        File.WriteAllText(script, Script);
        var (code, output, error) = Run([script, folder, unit == NgramUnit.Word ? "word" : "character",
            smoothing.ToString("R", System.Globalization.CultureInfo.InvariantCulture)], 1200);
        if (code != 0) throw new InvalidOperationException($"the reference script failed ({code}): {error}");
        var json = JsonNode.Parse(output.Trim().Split('\n')[^1])!;
        return new Figures((string)json["version"]!, (int)json["features"]!, (double)json["logistic_regression"]!, (double)json["naive_bayes"]!,
            (double)json["lr_seconds"]!);
    }

    static void Write(string path, IEnumerable<(string Text, int Label)> rows)
    {
        var sb = new StringBuilder();
        foreach (var (text, label) in rows) sb.Append(JsonSerializer.Serialize(new { text, label })).Append('\n');
        File.WriteAllText(path, sb.ToString(), new UTF8Encoding(false));
    }

    static (int Code, string Out, string Err) Run(IEnumerable<string> args, int timeoutSeconds)
    {
        var start = new ProcessStartInfo(Python) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in args) start.ArgumentList.Add(a);
        start.Environment["OMP_NUM_THREADS"] = "1";
        start.Environment["OPENBLAS_NUM_THREADS"] = "1";
        using var p = Process.Start(start)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeoutSeconds * 1000))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"{Python} did not finish in {timeoutSeconds} s");
        }
        p.WaitForExit();
        return (p.ExitCode, stdout.Result, stderr.Result);
    }
}
