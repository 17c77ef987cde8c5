using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>How much of one part's text a vocabulary covers: by occurrence and by distinct token.</summary>
public sealed record VocabularyCoverage(string Part, long Tokens, long UnknownTokens, int Types, int UnknownTypes)
{
    public double UnknownRate => Tokens == 0 ? 0 : (double)UnknownTokens / Tokens;
    public double Coverage => 1 - UnknownRate;
    public double UnknownTypeRate => Types == 0 ? 0 : (double)UnknownTypes / Types;

    public static DataFrame ToDataFrame(IEnumerable<VocabularyCoverage> rows)
    {
        var list = rows.ToList();
        return new DataFrame(
            new StringDataFrameColumn("part", list.Select(r => r.Part)),
            new Int64DataFrameColumn("tokens", list.Select(r => r.Tokens)),
            new Int64DataFrameColumn("unknown_tokens", list.Select(r => r.UnknownTokens)),
            new DoubleDataFrameColumn("unknown_rate", list.Select(r => r.UnknownRate)),
            new Int32DataFrameColumn("types", list.Select(r => r.Types)),
            new Int32DataFrameColumn("unknown_types", list.Select(r => r.UnknownTypes)));
    }

    public DataFrame ToDataFrame() => ToDataFrame([this]);
}
