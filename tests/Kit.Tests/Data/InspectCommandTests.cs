using Kit.Cli.Commands;
using Kit.Data;
using Kit.Experiments;

namespace Kit.Tests.Data;

public sealed class InspectCommandTests : IDisposable
{
    readonly string _dir = Directory.CreateTempSubdirectory("kit-inspect-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    (int Code, string Out, string Err) Run(string path, ColumnSpec? columns = null, string tokenizer = "character", RowPolicy policy = RowPolicy.Refuse)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        var spec = RunSettings.Find("tokenizer").Apply(RunSettings.Defaults with
        {
            DataPath = path, Columns = columns ?? new ColumnSpec(), GroupAware = columns?.Group is not null, SplitSeed = 1,
            TrainFraction = 0.8, ValidationFraction = 0.1, TestFraction = 0.1,
        }, tokenizer);
        int code = InspectCommand.Run(new InspectCommand.Settings(spec, policy), o, e);
        return (code, o.ToString(), e.ToString());
    }

    [Fact]
    public void PrintsProfileSplitAndAudit()
    {
        var path = Path.Combine(_dir, "d.csv");
        var rows = Enumerable.Range(0, 60).Select(i => $"host{i % 25},{(i % 3 == 0 ? "a" : "b")},g{i % 12}");
        File.WriteAllLines(path, new[] { "text,label,group" }.Concat(rows));
        var (code, output, err) = Run(path, new ColumnSpec(Group: "group"));
        Assert.Equal(0, code);
        Assert.Equal("", err);
        Assert.Contains($"{path}: 60 rows, 2 classes, tokenizer character", output);
        Assert.Contains("Split: group holdout 0.8/0.1/0.1, seed 1", output);
        Assert.Contains("Leakage audit", output);
        Assert.Contains("group in more than one part: 0 distinct, 0 row(s)", output);
        // host0 and host12… repeat across groups, so some texts cross parts: the audit must say so with a count.
        Assert.Matches(@"exact duplicate across parts: [1-9]\d* distinct", output);
    }

    [Fact]
    public void BadInputExitsWithTwoAndTheLocatedMessage()
    {
        var path = Path.Combine(_dir, "bad.csv");
        File.WriteAllText(path, "text,label\nok,1\nno,label,extra\n");
        var (code, output, err) = Run(path);
        Assert.Equal(InspectCommand.BadInput, code);
        Assert.Equal("", output);
        Assert.Equal($"{path}:3: ragged row: expected 2 field(s) as in the header, found 3{Environment.NewLine}", err);
    }

    [Fact]
    public void SkipPolicyReportsDroppedRows()
    {
        var path = Path.Combine(_dir, "some-bad.csv");
        File.WriteAllText(path, "text,label\nok,1\n,2\nfine,2\nmore,1\n");
        var (code, output, _) = Run(path, policy: RowPolicy.Skip, tokenizer: "word");
        Assert.Equal(0, code);
        Assert.Contains("skipped 1 row(s): 1 empty text (first at line 3)", output);
    }

    [Fact]
    public void WholeCommandLineParses()
    {
        var path = Path.Combine(_dir, "cli.csv");
        File.WriteAllText(path, "t,l\nx,1\n");
        var output = new StringWriter();
        var capture = new StringWriter();
        int code = Kit.Cli.Program.BuildRoot().Parse(["inspect", path, "--text", "t", "--label", "missing"])
            .Invoke(new System.CommandLine.InvocationConfiguration { Output = output, Error = capture });
        Assert.Equal(InspectCommand.BadInput, code);
        Assert.Equal("", output.ToString());
        Assert.Contains($"{path}:1: missing column 'missing' (header has: 't', 'l')", capture.ToString());
    }
}
