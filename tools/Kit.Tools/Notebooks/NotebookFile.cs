using System.Text.Json;
using Kit.Common;
using Microsoft.DotNet.Interactive.Documents;
using Microsoft.DotNet.Interactive.Documents.Jupyter;

namespace Kit.Tools.Notebooks;

/// <summary>Reading and writing .ipynb files (nbformat 4) with the kernel names the headless runner knows.</summary>
public static class NotebookFile
{
    public const string CSharp = "csharp";
    public const string Markdown = "markdown";

    public static KernelInfoCollection Kernels()
    {
        var kernels = new KernelInfoCollection
        {
            new KernelInfo(CSharp, "C#", new[] { "c#", "C#", "cs" }),
            new KernelInfo(Markdown, "Markdown", new[] { "md" }),
        };
        kernels.DefaultKernelName = CSharp;
        return kernels;
    }

    /// <summary>
    /// Checks the file before handing it to the document reader, whose errors do not say which file or line is
    /// wrong, and which accepts shapes (no cells, another nbformat) that would silently run nothing.
    /// </summary>
    public static InteractiveDocument Load(string path)
    {
        var rawCells = new List<int>();
        var document = Parse(path, rawCells);
        // The reader turns "raw" cells into code cells of the default language; they are text, not code to run.
        foreach (int i in rawCells)
            if (i < document.Elements.Count) document.Elements[i].KernelName = Markdown;
        return document;
    }

    static InteractiveDocument Parse(string path, List<int> rawCells)
    {
        string full = System.IO.Path.GetFullPath(path);
        if (!File.Exists(full)) throw new NotebookFormatException(full, "file not found");
        string json = File.ReadAllText(full);
        try
        {
            using var doc = JsonDocument.Parse(json, new JsonDocumentOptions { AllowTrailingCommas = false });
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object)
                throw new NotebookFormatException(full, $"expected a JSON object at the top, found {root.ValueKind}", 1);
            if (!root.TryGetProperty("nbformat", out var nbformat) || nbformat.ValueKind != JsonValueKind.Number)
                throw new NotebookFormatException(full, "no \"nbformat\" number; this is not a Jupyter notebook");
            if (nbformat.GetInt32() != 4)
                throw new NotebookFormatException(full, $"nbformat {nbformat.GetInt32()} is not supported; save it as nbformat 4");
            if (!root.TryGetProperty("cells", out var cells) || cells.ValueKind != JsonValueKind.Array)
                throw new NotebookFormatException(full, "no \"cells\" array");
            int i = 0;
            foreach (var cell in cells.EnumerateArray())
            {
                i++;
                if (cell.ValueKind != JsonValueKind.Object || !cell.TryGetProperty("cell_type", out var type) || type.ValueKind != JsonValueKind.String)
                    throw new NotebookFormatException(full, $"cell {i} has no \"cell_type\"");
                if (!cell.TryGetProperty("source", out var source) || source.ValueKind is not (JsonValueKind.String or JsonValueKind.Array))
                    throw new NotebookFormatException(full, $"cell {i} has no \"source\" text");
                if (type.GetString() == "raw") rawCells.Add(i - 1);
            }
        }
        catch (JsonException e)
        {
            // System.Text.Json counts lines from 0.
            throw new NotebookFormatException(full, "not valid JSON: " + FirstSentence(e.Message), e.LineNumber + 1);
        }
        try
        {
            return Notebook.Parse(json, Kernels());
        }
        catch (Exception e) when (e is JsonException or InvalidOperationException or ArgumentException or FormatException)
        {
            throw new NotebookFormatException(full, "could not be read as a notebook: " + e.Message);
        }
    }

    public static void Save(InteractiveDocument document, string path)
    {
        string dir = System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(path))!;
        Directory.CreateDirectory(dir);
        // Write, not ToJupyterJson: the latter casts the parsed kernelInfo metadata (a plain dictionary) and throws.
        using var buffer = new MemoryStream();
        Notebook.Write(document, buffer, Kernels());
        AtomicFile.WriteAllBytes(path, buffer.ToArray());
    }

    static string FirstSentence(string message)
    {
        int cut = message.IndexOf(" Path:", StringComparison.Ordinal);
        return cut > 0 ? message[..cut] : message;
    }
}
