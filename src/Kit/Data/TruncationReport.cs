using Microsoft.Data.Analysis;

namespace Kit.Data;

/// <summary>What encoding to a maximum length cost: rows cut, tokens dropped, and rows that came out empty.</summary>
public sealed record TruncationReport(int Rows, int MaxLength, TruncationPolicy Policy, int TruncatedRows, long TokensDropped,
    long TokensKept, int LongestBefore, int EmptyRows)
{
    public double TruncatedShare => Rows == 0 ? 0 : (double)TruncatedRows / Rows;

    public override string ToString() =>
        $"{TruncatedRows} of {Rows} row(s) cut to {MaxLength} tokens ({Policy}), {TokensDropped} token(s) dropped, longest was {LongestBefore}"
        + (EmptyRows > 0 ? $"; {EmptyRows} row(s) have no tokens" : "");

    public DataFrame ToDataFrame() => new(
        new Int32DataFrameColumn("rows", [Rows]),
        new Int32DataFrameColumn("max_length", [MaxLength]),
        new StringDataFrameColumn("policy", [Policy.ToString()]),
        new Int32DataFrameColumn("truncated_rows", [TruncatedRows]),
        new Int64DataFrameColumn("tokens_dropped", [TokensDropped]),
        new Int64DataFrameColumn("tokens_kept", [TokensKept]),
        new Int32DataFrameColumn("longest_before", [LongestBefore]),
        new Int32DataFrameColumn("empty_rows", [EmptyRows]));
}
