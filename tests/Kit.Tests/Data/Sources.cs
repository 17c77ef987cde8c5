using System.Text;
using Kit.Data;

namespace Kit.Tests.Data;

/// <summary>Reads in-memory text or bytes the way a file of that name would be read.</summary>
internal static class Sources
{
    public static readonly ColumnSpec Abc = new("a", "b");

    public static LabelledTable Csv(string text, ColumnSpec? spec = null, RowPolicy policy = RowPolicy.Refuse) =>
        TableReader.Parse("t.csv", Encoding.UTF8.GetBytes(text), spec ?? new ColumnSpec(), policy);

    public static LabelledTable Parse(string name, string text, ColumnSpec? spec = null, RowPolicy policy = RowPolicy.Refuse) =>
        TableReader.Parse(name, Encoding.UTF8.GetBytes(text), spec ?? new ColumnSpec(), policy);

    public static DataError Refused(string name, byte[] bytes, ColumnSpec? spec = null)
    {
        LabelledTable? table = null;
        var e = Assert.Throws<DataError>(() => table = TableReader.Parse(name, bytes, spec ?? new ColumnSpec()));
        Assert.Null(table);
        return e;
    }

    public static DataError Refused(string name, string text, ColumnSpec? spec = null) => Refused(name, Encoding.UTF8.GetBytes(text), spec);
}
