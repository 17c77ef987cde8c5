using System.CommandLine;
using Kit.Tools.Notebooks;

namespace Kit.Cli.Commands;

/// <summary>
/// `kit notebook run NB.ipynb [--out executed.ipynb] [--html page.html] [--feed DIR]`: runs the code cells in order
/// in an embedded C# kernel (working directory: the notebook's folder). Exit 0 when every cell passed, 1 when a
/// cell failed (`cell N failed: ...` on stderr), 2 when the file is missing or not a notebook.
/// `kit notebook feed`: packs Kit and Kit.Notebooks from this source tree into the local feed notebooks restore from.
/// </summary>
internal static class NotebookCommand
{
    public static Command Build() => new("notebook", "Run the kit's .NET notebooks headlessly and build the package feed they load the kit from.")
    {
        BuildRun(),
        BuildFeed(),
    };

    static Command BuildRun()
    {
        var notebook = new Argument<string>("notebook") { Description = "The .ipynb file to run (nbformat 4)" };
        var outOption = new Option<string?>("--out") { Description = "Write the executed notebook, with outputs, to this file" };
        var htmlOption = new Option<string?>("--html") { Description = "Write the executed notebook as one self-contained HTML page" };
        var feedOption = new Option<string?>("--feed") { Description = "Package folder to restore the kit from (default: artifacts/feed of the repository holding the notebook, if present)" };
        var timeoutOption = new Option<int>("--cell-timeout") { Description = "Seconds one cell may take before it counts as failed", DefaultValueFactory = _ => 600 };
        var run = new Command("run", "Run a notebook headlessly and stop at the first failing cell.") { notebook, outOption, htmlOption, feedOption, timeoutOption };
        run.SetAction(parse => Run(parse.GetValue(notebook)!, parse.GetValue(outOption), parse.GetValue(htmlOption), parse.GetValue(feedOption), parse.GetValue(timeoutOption)));
        return run;
    }

    static Command BuildFeed()
    {
        var repoOption = new Option<string>("--repo") { Description = "Repository root (the folder with Kit.sln)", DefaultValueFactory = _ => "." };
        var outOption = new Option<string?>("--out") { Description = "Feed folder (default: artifacts/feed under the repository)" };
        var feed = new Command("feed", "Pack Kit and Kit.Notebooks into the local package feed (skipped when the sources are unchanged).") { repoOption, outOption };
        feed.SetAction(parse =>
        {
            string repo;
            try { repo = LocalFeed.FindRepoRoot(parse.GetValue(repoOption)!); }
            catch (DirectoryNotFoundException e) { Console.Error.WriteLine(e.Message); return 2; }
            Console.WriteLine($"feed: {LocalFeed.Ensure(repo, parse.GetValue(outOption), Console.Out)}");
            return 0;
        });
        return feed;
    }

    static int Run(string path, string? outPath, string? htmlPath, string? feed, int timeoutSeconds)
    {
        if (timeoutSeconds <= 0)
        {
            Console.Error.WriteLine($"--cell-timeout must be a positive number of seconds, got {timeoutSeconds}");
            return 2;
        }
        if (feed is not null && !Directory.Exists(feed))
        {
            Console.Error.WriteLine($"{Path.GetFullPath(feed)}: package feed folder not found (make it with `kit notebook feed`)");
            return 2;
        }
        feed ??= DefaultFeed(path);
        if (feed is not null) Console.WriteLine($"package feed: {feed}");
        var runner = new NotebookRunner
        {
            CellTimeout = TimeSpan.FromSeconds(timeoutSeconds),
            PackageSources = feed is null ? Array.Empty<string>() : new[] { Path.GetFullPath(feed) },
            OnCell = c => Console.WriteLine($"cell {c.Number} {(c.Status == CellStatus.Passed ? "ok" : "FAILED")} ({c.Elapsed.TotalSeconds:F1} s)"),
        };
        NotebookRunResult result;
        try
        {
            result = runner.RunAsync(path).GetAwaiter().GetResult();
        }
        catch (NotebookFormatException e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }
        if (result.FailureMessage is { } failure)
        {
            Console.Error.WriteLine(failure);
            if (failure.Contains("NU1101", StringComparison.Ordinal) && failure.Contains("Kit", StringComparison.Ordinal))
                Console.Error.WriteLine("hint: the kit's packages are not in any source; run `kit notebook feed` in the repository, or pass --feed DIR");
        }
        if (outPath is not null)
        {
            result.SaveNotebook(outPath);
            Console.WriteLine($"wrote {outPath}");
        }
        if (htmlPath is not null)
        {
            result.SaveHtml(htmlPath);
            Console.WriteLine($"wrote {htmlPath}");
        }
        if (!result.Succeeded) return 1;
        Console.WriteLine($"{result.Path}: {result.Cells.Count(c => c.Status == CellStatus.Passed)} code cells passed in {result.Elapsed.TotalSeconds:F1} s");
        return 0;
    }

    static string? DefaultFeed(string notebook)
    {
        try
        {
            string dir = LocalFeed.DefaultFolder(LocalFeed.FindRepoRoot(Path.GetDirectoryName(Path.GetFullPath(notebook)) ?? "."));
            return Directory.Exists(dir) ? dir : null;
        }
        catch (DirectoryNotFoundException)
        {
            return null;
        }
    }
}
