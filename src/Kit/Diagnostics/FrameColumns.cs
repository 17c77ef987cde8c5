using Microsoft.Data.Analysis;

namespace Kit.Diagnostics;

/// <summary>Small constructors so each record's ToDataFrame reads as a list of named columns.</summary>
internal static class FrameColumns
{
    public static StringDataFrameColumn Text(string name, IEnumerable<string?> values) => new(name, values.Select(v => v ?? ""));
    public static DoubleDataFrameColumn Number(string name, IEnumerable<double> values) => new(name, values);
    public static Int32DataFrameColumn Count(string name, IEnumerable<int> values) => new(name, values);
    public static BooleanDataFrameColumn Flag(string name, IEnumerable<bool?> values) => new(name, values);
}
