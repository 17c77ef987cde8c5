using Kit.Data;
using static Kit.Tests.Data.Sources;

namespace Kit.Tests.Data;

/// <summary>
/// The delimited reader against RFC 4180 ("Common Format and MIME Type for CSV Files", Shafranovich, 2005):
/// the numbered rules of section 2 and the ABNF grammar at its end. Each test names the rule it checks.
/// </summary>
public class CsvGrammarTests
{
    // RFC 4180 §2 rule 1: records separated by CRLF. Rule 3: an optional header line in the same format.
    [Fact]
    public void Rule1And3_CrlfRecordsAfterAHeader()
    {
        var t = Csv("a,b,c\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n", Abc);
        Assert.Equal(["aaa", "zzz"], t.Texts);
        Assert.Equal(["bbb", "yyy"], t.Labels);
        Assert.Equal([2, 3], t.Lines);
    }

    // RFC 4180 §2 rule 2: the last record may or may not end with a line break.
    [Fact]
    public void Rule2_LastRecordWithoutLineBreak()
    {
        var t = Csv("a,b,c\r\naaa,bbb,ccc\r\nzzz,yyy,xxx", Abc);
        Assert.Equal(["aaa", "zzz"], t.Texts);
        Assert.Equal(["bbb", "yyy"], t.Labels);
    }

    // RFC 4180 §2 rule 4: spaces are part of a field and must not be ignored.
    [Fact]
    public void Rule4_SpacesArePartOfTheField()
    {
        var t = Csv("a,b\r\n aaa , bbb\r\n", Abc);
        Assert.Equal(" aaa ", t.Texts[0]);
        Assert.Equal(" bbb", t.Labels[0]);
    }

    // RFC 4180 §2 rule 5: each field may be enclosed in double quotes.
    [Fact]
    public void Rule5_QuotedAndUnquotedFieldsMix()
    {
        var t = Csv("a,b,c\r\n\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx\r\n", Abc);
        Assert.Equal(["aaa", "zzz"], t.Texts);
        Assert.Equal(["bbb", "yyy"], t.Labels);
    }

    // RFC 4180 §2 rule 6: fields with line breaks, double quotes or commas are enclosed in quotes.
    [Fact]
    public void Rule6_LineBreaksAndCommasInsideQuotes()
    {
        var t = Csv("a,b,c\r\n\"aaa\",\"b\r\nbb\",\"ccc\"\r\nzzz,\"y,y\",xxx\r\n", new ColumnSpec("b", "c"));
        Assert.Equal(["b\r\nbb", "y,y"], t.Texts);
        // The second record starts on physical line 4, because the first spans lines 2 and 3.
        Assert.Equal([2, 4], t.Lines);
    }

    // RFC 4180 §2 rule 7: a double quote inside a quoted field is escaped by another double quote.
    [Fact]
    public void Rule7_DoubledQuoteIsOneQuote()
    {
        var t = Csv("a,b,c\r\n\"aaa\",\"b\"\"bb\",\"ccc\"\r\n", new ColumnSpec("b", "c"));
        Assert.Equal("b\"bb", t.Texts[0]);
        Assert.Equal("ccc", t.Labels[0]);
    }

    // RFC 4180 ABNF: escaped = DQUOTE *(TEXTDATA / COMMA / CR / LF / 2DQUOTE) DQUOTE, so a quoted field may be
    // empty, or consist only of an escaped quote.
    [Fact]
    public void Grammar_EscapedFieldEdgeCases()
    {
        var t = Csv("a,b,c\r\n\"\"\"\",x,\"\"\r\n", new ColumnSpec("a", "b", Group: null));
        Assert.Equal("\"", t.Texts[0]);
        var empty = Csv("a,b,c\r\nq,x,\"\"\r\n", new ColumnSpec("a", "b"));
        Assert.Equal("q", empty.Texts[0]);
    }

    // RFC 4180 ABNF: non-escaped = *TEXTDATA, so an empty field between two commas is allowed (here an unused column).
    [Fact]
    public void Grammar_EmptyUnquotedFieldInUnusedColumn()
    {
        var t = Csv("a,b,c\r\nx,,y\r\n", new ColumnSpec("a", "c"));
        Assert.Equal("x", t.Texts[0]);
        Assert.Equal("y", t.Labels[0]);
    }

    // RFC 4180 §3 (MIME registration) allows other line break conventions in practice; LF-only and lone CR are accepted.
    [Theory]
    [InlineData("\n")]
    [InlineData("\r")]
    public void OtherLineBreaks(string br)
    {
        var t = Csv($"text,label{br}x,1{br}\"y{br}z\",2{br}w,3", new ColumnSpec());
        Assert.Equal(["x", $"y{br}z", "w"], t.Texts);
        Assert.Equal([2, 3, 5], t.Lines);
    }

    [Fact]
    public void ByteOrderMarkIsDropped()
    {
        var bytes = new byte[] { 0xEF, 0xBB, 0xBF }.Concat("text,label\nhé,1\n"u8.ToArray()).ToArray();
        var t = TableReader.Parse("bom.csv", bytes, new ColumnSpec());
        Assert.Equal("hé", t.Texts[0]);
    }

    [Fact]
    public void TsvUsesTabsAndTheSameQuoting()
    {
        var t = Parse("x.tsv", "text\tlabel\tgroup\na,b\tl1\tg1\n\"c\td\"\tl2\tg2\n", new ColumnSpec(Group: "group"));
        Assert.Equal(["a,b", "c\td"], t.Texts);
        Assert.Equal(["g1", "g2"], t.Groups);
    }

    [Fact]
    public void GroupAndSplitColumnsAreRead()
    {
        var t = Csv("text,label,g,s\nx,1,k,TRAIN\ny,2,k,valid\nz,1,m,test\n", new ColumnSpec(Group: "g", Split: "s"));
        Assert.Equal(["k", "k", "m"], t.Groups);
        Assert.Equal(["train", "validation", "test"], t.Splits);
        // Repeated values share one string instance.
        Assert.Same(t.Groups![0], t.Groups[1]);
    }

    [Fact]
    public void ToDataFrameHasOneRowPerRecord()
    {
        var t = Csv("text,label,g\nx,1,k\ny,2,m\n", new ColumnSpec(Group: "g"));
        var df = t.ToDataFrame();
        Assert.Equal(2, df.Rows.Count);
        Assert.Equal(["line", "text", "label", "group"], df.Columns.Select(c => c.Name));
        Assert.Equal("m", df.Columns["group"][1]);
        Assert.Equal(3, df.Columns["line"][1]);
    }

    [Fact]
    public void DemoFilesRead()
    {
        var dir = Path.Combine(RepoRoot(), "data-demo");
        var t = TableReader.Read(Path.Combine(dir, "hostnames.csv"), new ColumnSpec(Group: "group"));
        Assert.Equal(File.ReadAllLines(Path.Combine(dir, "hostnames.csv")).Length - 1, t.Count);
        Assert.True(t.SkipReport.IsEmpty);
    }

    internal static string RepoRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Kit.sln"))) dir = dir.Parent;
        return dir?.FullName ?? throw new InvalidOperationException("repository root not found");
    }
}
