using Kit.Common;
using System.Text;
using Kit.Data;

namespace Kit.Tests.Data;

/// <summary>
/// Random bytes and random CSV / JSON Lines fragments (12,000 inputs, each read under both policies): the readers
/// either return a sound table or throw a <see cref="DataError"/>; any other exception, or not finishing, fails.
/// </summary>
public class ReaderFuzzTests
{
    static readonly string[] CsvPieces = ["a", "b", "xy", ",", ",", "\"", "\"\"", "\r\n", "\n", "\r", "\t", " ", "é", "\U0001F600", "text", "label"];
    static readonly string[] JsonPieces = ["{", "}", "\"text\"", "\"label\"", ":", ",", "\"a\"", "1", "null", "\\u0000", "\\ud800", "\"", "\n", "[", "]", " ", "\\"];

    [Fact]
    public async Task ReadersOnlyEverThrowDataError()
    {
        var work = Task.Run(() =>
        {
            var rng = new SplitMix64(20261201);
            int cases = 0, accepted = 0;
            for (int i = 0; i < 3000; i++, cases++)
            {
                var bytes = new byte[rng.NextInt(64)];
                for (int b = 0; b < bytes.Length; b++) bytes[b] = (byte)rng.NextInt(256);
                accepted += Check(i % 2 == 0 ? "f.csv" : "f.jsonl", bytes);
            }
            for (int i = 0; i < 6000; i++, cases++)
            {
                var sb = new StringBuilder("text,label\n");
                int n = rng.NextInt(24);
                for (int k = 0; k < n; k++) sb.Append(CsvPieces[rng.NextInt(CsvPieces.Length)]);
                var bytes = Encoding.UTF8.GetBytes(sb.ToString());
                if (rng.NextInt(20) == 0 && bytes.Length > 0) bytes[rng.NextInt(bytes.Length)] = (byte)(rng.NextInt(2) == 0 ? 0 : 0xFF);
                accepted += Check(i % 3 == 0 ? "f.tsv" : "f.csv", bytes);
            }
            for (int i = 0; i < 3000; i++, cases++)
            {
                var sb = new StringBuilder();
                int n = rng.NextInt(20);
                for (int k = 0; k < n; k++) sb.Append(JsonPieces[rng.NextInt(JsonPieces.Length)]);
                if (i % 2 == 0) sb.Insert(0, "{\"text\":\"x\",\"label\":\"y\"}\n");
                accepted += Check("f.jsonl", Encoding.UTF8.GetBytes(sb.ToString()));
            }
            return (cases, accepted);
        });
        // A generous bound: the loop takes about a second; it exists to turn a hang into a failure.
        var finished = await Task.WhenAny(work, Task.Delay(TimeSpan.FromMinutes(3)));
        Assert.True(finished == work, "the readers did not finish: a hang");
        var (total, ok) = await work;
        Assert.Equal(12_000, total);
        // Both outcomes must occur, or the generator is not exercising the reader.
        Assert.InRange(ok, 100, total - 1000);
    }

    static int Check(string name, byte[] bytes)
    {
        int accepted = 0;
        foreach (var policy in new[] { RowPolicy.Refuse, RowPolicy.Skip })
        {
            try
            {
                var t = TableReader.Parse(name, bytes, new ColumnSpec(), policy);
                Assert.True(t.Count > 0);
                Assert.All(t.Texts, s => Assert.False(string.IsNullOrWhiteSpace(s)));
                Assert.All(t.Labels, s => Assert.False(string.IsNullOrWhiteSpace(s)));
                for (int i = 1; i < t.Lines.Length; i++) Assert.True(t.Lines[i] > t.Lines[i - 1]);
                if (policy == RowPolicy.Refuse)
                {
                    Assert.True(t.SkipReport.IsEmpty);
                    accepted++;
                    if (name.EndsWith(".csv", StringComparison.Ordinal)) RoundTrips(t);
                }
            }
            catch (DataError e)
            {
                Assert.StartsWith($"{name}:{e.Line}:", e.Message);
                Assert.False(string.IsNullOrWhiteSpace(e.Problem));
            }
        }
        return accepted;
    }

    /// <summary>Writing the table back out with RFC 4180 quoting and reading it again gives the same rows.</summary>
    static void RoundTrips(LabelledTable t)
    {
        static string Quote(string s) => "\"" + s.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";
        var sb = new StringBuilder("text,label\r\n");
        for (int i = 0; i < t.Count; i++) sb.Append(Quote(t.Texts[i])).Append(',').Append(Quote(t.Labels[i])).Append("\r\n");
        var back = TableReader.Parse("back.csv", Encoding.UTF8.GetBytes(sb.ToString()), new ColumnSpec());
        Assert.Equal(t.Texts, back.Texts);
        Assert.Equal(t.Labels, back.Labels);
    }
}
