using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>
/// Class × bin table: for each true class and bin, how many examples there are and what share of them was
/// classified correctly (that class's recall inside the bin; NaN where the cell is empty).
/// </summary>
public sealed record ClassByBinTable(IReadOnlyList<string> ClassNames, IReadOnlyList<string> Bins, int[,] Count, int[,] Correct)
{
    public double Recall(int classIndex, int bin) =>
        Count[classIndex, bin] == 0 ? double.NaN : (double)Correct[classIndex, bin] / Count[classIndex, bin];

    /// <summary>Wide table: a Class column, then one recall column per bin and one count column per bin.</summary>
    public DataFrame ToDataFrame()
    {
        var columns = new List<DataFrameColumn> { FrameColumns.Text("Class", ClassNames) };
        for (int b = 0; b < Bins.Count; b++)
        {
            int bin = b;
            columns.Add(FrameColumns.Number($"Recall {Bins[b]}", Enumerable.Range(0, ClassNames.Count).Select(c => Recall(c, bin))));
        }
        for (int b = 0; b < Bins.Count; b++)
        {
            int bin = b;
            columns.Add(FrameColumns.Count($"Count {Bins[b]}", Enumerable.Range(0, ClassNames.Count).Select(c => Count[c, bin])));
        }
        return new DataFrame(columns);
    }
}
