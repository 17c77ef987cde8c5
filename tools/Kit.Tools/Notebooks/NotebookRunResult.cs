using Microsoft.DotNet.Interactive.Documents;

namespace Kit.Tools.Notebooks;

/// <summary>A headless run of one notebook: every cell's outcome, and the executed document ready to save.</summary>
public sealed record NotebookRunResult(string Path, IReadOnlyList<CellOutcome> Cells, InteractiveDocument Executed, TimeSpan Elapsed)
{
    public CellOutcome? Failure => Cells.FirstOrDefault(c => c.Status == CellStatus.Failed);
    public bool Succeeded => Failure is null;

    /// <summary>The line the CLI prints and tests assert on: "cell N failed: ...".</summary>
    public string? FailureMessage => Failure switch
    {
        null => null,
        { Number: 0 } f => $"package source setup failed: {f.Error}",
        var f => $"cell {f.Number} failed: {f.Error}",
    };

    public IEnumerable<CellOutput> Outputs => Cells.SelectMany(c => c.Outputs);

    public void SaveNotebook(string path) => NotebookFile.Save(Executed, path);

    public void SaveHtml(string path, string? title = null) =>
        Kit.Common.AtomicFile.WriteAllText(path, NotebookHtml.Render(this, title ?? System.IO.Path.GetFileNameWithoutExtension(Path)));
}
