using System.Text;
using Kit.Data;
using Microsoft.Data.Analysis;
using static Kit.Tests.Data.Sources;

namespace Kit.Tests.Data;

/// <summary>
/// Every kind of bad input the readers refuse: the exact FILE:LINE[:COL]: problem message, and no table handed
/// back (the reader throws before returning anything). Under the skip policy the same rows are dropped and counted.
/// </summary>
public class BadInputTests
{
    [Fact]
    public void RaggedRow()
    {
        var e = Refused("t.csv", "text,label\nok,1\ntoo,many,fields\n");
        Assert.Equal("t.csv:3: ragged row: expected 2 field(s) as in the header, found 3", e.Message);
        Assert.Equal(("t.csv", 3, (int?)null), (e.File, e.Line, e.Column));
    }

    [Fact]
    public void RaggedRowWithTooFewFields()
    {
        var e = Refused("t.csv", "text,label,group\nok,1,g\nshort,1\n", new ColumnSpec(Group: "group"));
        Assert.Equal("t.csv:3: ragged row: expected 3 field(s) as in the header, found 2", e.Message);
    }

    [Fact]
    public void UnterminatedQuoteNamesWhereItOpened()
    {
        var e = Refused("t.csv", "text,label\nok,1\nfine,\"never\nclosed,2\n");
        Assert.Equal("t.csv:3:6: unterminated quote: the quoted field opened here never closes", e.Message);
        Assert.Equal(6, e.Column);
    }

    [Fact]
    public void UnterminatedQuoteIsRefusedEvenWhenSkipping()
    {
        Assert.Throws<DataError>(() => Csv("text,label\n\"open,1\nx,2\n", policy: RowPolicy.Skip));
    }

    [Fact]
    public void QuoteInsideUnquotedField()
    {
        var e = Refused("t.csv", "text,label\nab\"c,1\n");
        Assert.Equal("t.csv:2:3: malformed quoting: a double quote inside an unquoted field (enclose the field in quotes and double the quote)", e.Message);
    }

    [Fact]
    public void TextAfterClosingQuote()
    {
        var e = Refused("t.csv", "text,label\n\"ab\"c,1\n");
        Assert.Equal("t.csv:2:5: malformed quoting: text after the closing quote of a quoted field", e.Message);
    }

    [Fact]
    public void InvalidUtf8NamesLineAndColumn()
    {
        // 0xC3 0x28 is an invalid two-byte sequence (the second byte is not a continuation byte), RFC 3629 §3.
        var bytes = Encoding.UTF8.GetBytes("text,label\nok,1\nnaïve").Concat(new byte[] { 0xC3, 0x28 }).Concat(",2\n"u8.ToArray()).ToArray();
        var e = Refused("t.csv", bytes);
        Assert.Equal("t.csv:3:6: invalid UTF-8 (byte 0xC3 at file offset 22)", e.Message);
    }

    [Fact]
    public void OverlongEncodingIsInvalidUtf8()
    {
        // RFC 3629 §3: the overlong form C0 AF (for '/') must not be decoded.
        var bytes = "text,label\n"u8.ToArray().Concat(new byte[] { 0xC0, 0xAF }).Concat(",1\n"u8.ToArray()).ToArray();
        Assert.StartsWith("t.csv:2:1: invalid UTF-8 (byte 0xC0", Refused("t.csv", bytes).Message);
    }

    [Fact]
    public void NulByte()
    {
        var bytes = "text,label\nok,1\nab"u8.ToArray().Concat(new byte[] { 0 }).Concat(",2\n"u8.ToArray()).ToArray();
        var e = Refused("t.csv", bytes);
        Assert.Equal("t.csv:3:3: NUL byte in file (is it UTF-16 or binary? expected UTF-8 text)", e.Message);
    }

    [Fact]
    public void Utf16FileIsRefusedAsNulBytes()
    {
        var bytes = Encoding.Unicode.GetPreamble().Concat(Encoding.Unicode.GetBytes("text,label\nx,1\n")).ToArray();
        var e = Refused("t.csv", bytes);
        Assert.Contains("invalid UTF-8", e.Message); // FF FE is not valid UTF-8, and comes before the first NUL.
        Assert.Equal(1, e.Line);
    }

    [Theory]
    [InlineData("t.csv")]
    [InlineData("t.jsonl")]
    public void EmptyFile(string name)
    {
        Assert.Equal($"{name}:1: empty file", Refused(name, Array.Empty<byte>()).Message);
        Assert.Equal($"{name}:1: empty file (only a byte order mark)", Refused(name, new byte[] { 0xEF, 0xBB, 0xBF }).Message);
    }

    [Fact]
    public void HeaderWithoutRows()
    {
        Assert.Equal("t.csv:1: empty file: no data rows", Refused("t.csv", "text,label\n").Message);
    }

    [Fact]
    public void MissingHeader()
    {
        Assert.Equal("t.csv:1: missing header: the first line is blank", Refused("t.csv", "\nx,1\n").Message);
    }

    [Fact]
    public void MissingColumn()
    {
        var e = Refused("t.csv", "name,label\nx,1\n");
        Assert.Equal("t.csv:1: missing column 'text' (header has: 'name', 'label')", e.Message);
    }

    [Fact]
    public void MissingGroupColumn()
    {
        var e = Refused("t.csv", "text,label\nx,1\n", new ColumnSpec(Group: "host"));
        Assert.Equal("t.csv:1: missing column 'host' (header has: 'text', 'label')", e.Message);
    }

    [Fact]
    public void DuplicatedColumn()
    {
        Assert.Equal("t.csv:1: column 'text' appears twice in the header (fields 1 and 3)", Refused("t.csv", "text,label,text\nx,1,y\n").Message);
    }

    [Fact]
    public void EmptyText()
    {
        var e = Refused("t.csv", "label,text\n1,ok\n2,\n");
        Assert.Equal("t.csv:3:3: empty text in column 'text'", e.Message);
    }

    [Fact]
    public void WhiteSpaceOnlyText()
    {
        Assert.Equal("t.csv:2:1: text in column 'text' is only white space", Refused("t.csv", "text,label\n\"  \",1\n").Message);
    }

    [Fact]
    public void MissingLabel()
    {
        Assert.Equal("t.csv:3:4: missing label in column 'label'", Refused("t.csv", "text,label\nok,1\nab,\n").Message);
    }

    [Fact]
    public void MissingGroupValue()
    {
        Assert.Equal("t.csv:2:5: missing group in column 'g'", Refused("t.csv", "text,label,g\nx,1,\n", new ColumnSpec(Group: "g")).Message);
    }

    [Fact]
    public void UnknownSplitValue()
    {
        var e = Refused("t.csv", "text,label,s\nx,1,holdout\n", new ColumnSpec(Split: "s"));
        Assert.Equal("t.csv:2:5: split value 'holdout' in column 's' is not one of train, validation (or valid, val, dev), test", e.Message);
    }

    [Fact]
    public void BlankLineInsideTheFile()
    {
        Assert.Equal("t.csv:3: blank line (a record must have 2 field(s))", Refused("t.csv", "text,label\nx,1\n\ny,2\n").Message);
    }

    [Theory]
    [InlineData("t.csv", "text,label\nx,1\n\n\r\n")]
    [InlineData("t.jsonl", "{\"text\":\"x\",\"label\":1}\n\n  \n")]
    public void EmptyLinesAtTheEndAreNotRows(string name, string text)
    {
        var t = Parse(name, text);
        Assert.Equal(["x"], t.Texts);
        Assert.True(t.SkipReport.IsEmpty);
    }

    [Fact]
    public void SkipPolicyDropsRowsAndSaysWhy()
    {
        var t = Csv("text,label\nok,1\n,2\nab,\ntoo,many,3\n\"q\"x,1\n\nfine,2\n", policy: RowPolicy.Skip);
        Assert.Equal(["ok", "fine"], t.Texts);
        Assert.Equal([2, 8], t.Lines);
        var r = t.SkipReport;
        Assert.Equal(5, r.Total);
        Assert.Equal(1, r.Counts["empty text"]);
        Assert.Equal(1, r.Counts["missing label"]);
        Assert.Equal(1, r.Counts["ragged row"]);
        Assert.Equal(1, r.Counts["malformed quoting"]);
        Assert.Equal(1, r.Counts["blank line"]);
        Assert.Equal([5], r.FirstLines("ragged row"));
        Assert.Contains("skipped 5 row(s)", r.ToString());
        Assert.Equal(5, r.ToDataFrame().Rows.Count);
    }

    [Fact]
    public void SkipPolicyWithNothingLeftIsAnError()
    {
        var e = Assert.Throws<DataError>(() => Csv("text,label\n,1\n,2\n", policy: RowPolicy.Skip));
        Assert.StartsWith("t.csv:1: no usable rows: skipped 2 row(s): 2 empty text", e.Message);
    }

    [Fact]
    public void RefusingLeavesTheSkipReportEmpty()
    {
        Assert.True(Csv("text,label\nx,1\n").SkipReport.IsEmpty);
    }

    [Fact]
    public void UnknownExtension()
    {
        Assert.Equal("t.xlsx:0: unknown file type '.xlsx' (expected one of .csv, .tsv, .tab, .jsonl, .ndjson)", Refused("t.xlsx", "x").Message);
    }

    [Fact]
    public void MissingFileIsADataError()
    {
        var e = Assert.Throws<DataError>(() => TableReader.Read("/nonexistent/none.csv", new ColumnSpec()));
        Assert.StartsWith("/nonexistent/none.csv:0: cannot read file:", e.Message);
    }

    [Fact]
    public void FileTooLargeIsRefusedBeforeReading()
    {
        var path = Path.Combine(Path.GetTempPath(), $"kit-big-{Guid.NewGuid():N}.csv");
        try
        {
            // A sparse file: its length is over the limit, but nothing is written or read.
            using (var f = File.Create(path)) f.SetLength(TableReader.MaxFileBytes + 1);
            var e = Assert.Throws<DataError>(() => TableReader.Read(path, new ColumnSpec()));
            Assert.Equal($"{path}:0: file too large (1,000,000,001 bytes; this reader holds the whole file in memory, up to 1,000,000,000 bytes)", e.Message);
        }
        finally { File.Delete(path); }
    }

    // JSON Lines (jsonlines.org): one valid JSON value per line, UTF-8.
    [Fact]
    public void JsonLinesProblems()
    {
        Assert.Equal("t.jsonl:2:12: invalid JSON: Expected depth to be zero at the end of the JSON payload. There is an open JSON object or array that should be closed",
            Refused("t.jsonl", "{\"text\":\"a\",\"label\":1}\n{\"text\":\"b\"\n").Message);
        Assert.Equal("t.jsonl:1:1: expected a JSON object, found array", Refused("t.jsonl", "[1,2]\n").Message);
        Assert.Equal("t.jsonl:1: missing field 'text'", Refused("t.jsonl", "{\"label\":\"x\"}\n").Message);
        Assert.Equal("t.jsonl:1: missing label: no field 'label'", Refused("t.jsonl", "{\"text\":\"x\"}\n").Message);
        Assert.Equal("t.jsonl:1: missing label in column 'label'", Refused("t.jsonl", "{\"text\":\"x\",\"label\":\"\"}\n").Message);
        Assert.Equal("t.jsonl:1: empty text in column 'text'", Refused("t.jsonl", "{\"text\":\"\",\"label\":\"a\"}\n").Message);
        Assert.Equal("t.jsonl:1: field 'text' is a number, expected a string", Refused("t.jsonl", "{\"text\":5,\"label\":\"a\"}\n").Message);
        Assert.Equal("t.jsonl:1: field 'text' holds an escaped lone surrogate, which is not valid Unicode text",
            Refused("t.jsonl", "{\"text\":\"\\ud800\",\"label\":\"a\"}\n").Message);
        Assert.Equal("t.jsonl:1: NUL character in column 'text'", Refused("t.jsonl", "{\"text\":\"a\\u0000b\",\"label\":\"a\"}\n").Message);
        Assert.Equal("t.jsonl:2: blank line (every line must hold one JSON object)",
            Refused("t.jsonl", "{\"text\":\"a\",\"label\":1}\n\n{\"text\":\"b\",\"label\":1}\n").Message);
    }

    [Fact]
    public void JsonLinesReadsScalarsAndCrlf()
    {
        var t = Parse("t.ndjson", "{\"text\":\"a\\nb\",\"label\":3,\"g\":true}\r\n{\"label\":\"x\",\"text\":\"c\",\"g\":\"k\"}\r\n", new ColumnSpec(Group: "g"));
        Assert.Equal(["a\nb", "c"], t.Texts);
        Assert.Equal(["3", "x"], t.Labels);
        Assert.Equal(["true", "k"], t.Groups);
        Assert.Equal([1, 2], t.Lines);
    }

    [Fact]
    public void DataFrameProblems()
    {
        var df = new DataFrame(new StringDataFrameColumn("text", ["a", null!, "c"]), new Int32DataFrameColumn("label", [1, 2, null]));
        LabelledTable? t = null;
        var e = Assert.Throws<DataError>(() => t = TableReader.FromDataFrame(df, new ColumnSpec(), "frame"));
        Assert.Equal("frame:2: empty text in column 'text' (null)", e.Message);
        Assert.Null(t);
        Assert.Equal("frame:0: missing column 'group' (columns: 'text', 'label')",
            Assert.Throws<DataError>(() => TableReader.FromDataFrame(df, new ColumnSpec(Group: "group"), "frame")).Message);
        var skipped = TableReader.FromDataFrame(df, new ColumnSpec(), "frame", RowPolicy.Skip);
        Assert.Equal(["a"], skipped.Texts);
        Assert.Equal(["1"], skipped.Labels);
        Assert.Equal(1, skipped.SkipReport.Counts["missing label"]);
        Assert.Equal(1, skipped.SkipReport.Counts["empty text"]);
    }

    [Fact]
    public void DataFrameRoundTrip()
    {
        var original = Csv("text,label,g\nx,1,k\ny,2,m\n", new ColumnSpec(Group: "g"));
        var back = TableReader.FromDataFrame(original.ToDataFrame(), new ColumnSpec(Group: "group"));
        Assert.Equal(original.Texts, back.Texts);
        Assert.Equal(original.Labels, back.Labels);
        Assert.Equal(original.Groups, back.Groups);
    }
}
