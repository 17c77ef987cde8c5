using Kit.Batching;
using Kit.Data;
using TorchSharp;

namespace Kit.Tests.Batching;

public class BatchBuilderTests
{
    static readonly EncodedSet Set = EncodedSet.FromSequences(
        new[] { new[] { 2, 3, 4 }, new[] { 5, 6 }, new[] { 7, 8, 9, 10, 11 }, new[] { 12 } },
        new[] { 0, 1, 2, 1 });

    public BatchBuilderTests() => TestEngine.Load();

    static long[] Flat(torch.Tensor t) => t.data<long>().ToArray();
    static bool[] FlatBool(torch.Tensor t) => t.data<bool>().ToArray();

    [Fact]
    public void Right_padding_to_batch_max_keeps_tokens_in_front_and_marks_them()
    {
        using var b = BatchBuilder.Build(Set, new[] { 2, 0, 3 }, new PaddingOptions());
        Assert.Equal(new long[] { 3, 5 }, b.Tokens.shape);
        Assert.Equal(new long[] { 7, 8, 9, 10, 11, 2, 3, 4, 0, 0, 12, 0, 0, 0, 0 }, Flat(b.Tokens));
        Assert.Equal(new[] { true, true, true, true, true, true, true, true, false, false, true, false, false, false, false }, FlatBool(b.Mask));
        Assert.Equal(new long[] { 5, 3, 1 }, Flat(b.Lengths));
        Assert.Equal(new long[] { 2, 0, 1 }, Flat(b.Labels));
        Assert.Equal(new[] { 2, 0, 3 }, b.Rows);
        Assert.Equal(9, b.RealTokens);
        Assert.Equal(6, b.PaddedTokens);
        Assert.Equal(b.Positions, b.RealTokens + b.PaddedTokens);
        Assert.Equal(torch.ScalarType.Int64, b.Tokens.dtype);
        Assert.Equal(torch.ScalarType.Bool, b.Mask.dtype);
        Assert.Equal(DeviceType.CPU, b.Lengths.device_type);
    }

    [Fact]
    public void Left_padding_to_a_fixed_length_puts_pads_first()
    {
        using var b = BatchBuilder.Build(Set, new[] { 1, 3 }, new PaddingOptions(PadTo.Fixed, 4, PadSide.Left));
        Assert.Equal(new long[] { 0, 0, 5, 6, 0, 0, 0, 12 }, Flat(b.Tokens));
        Assert.Equal(new[] { false, false, true, true, false, false, false, true }, FlatBool(b.Mask));
        Assert.Equal(new long[] { 2, 1 }, Flat(b.Lengths));
        Assert.Equal(PadSide.Left, b.Side);
        Assert.Equal(5, b.PaddedTokens);
    }

    [Fact]
    public void A_row_longer_than_the_fixed_length_is_an_error_naming_it_unless_truncation_is_asked_for()
    {
        var e = Assert.Throws<ArgumentException>(() => BatchBuilder.Build(Set, new[] { 0, 2 }, new PaddingOptions(PadTo.Fixed, 4)));
        Assert.Contains("row 2", e.Message);
        Assert.Contains("5 tokens", e.Message);

        using var b = BatchBuilder.Build(Set, new[] { 0, 2 }, new PaddingOptions(PadTo.Fixed, 4, Truncate: true));
        Assert.Equal(new long[] { 2, 3, 4, 0, 7, 8, 9, 10 }, Flat(b.Tokens));
        Assert.Equal(new long[] { 3, 4 }, Flat(b.Lengths));
    }

    [Fact]
    public void Empty_rows_and_bad_options_are_refused_with_a_reason()
    {
        var withEmpty = EncodedSet.FromSequences(new[] { new[] { 2 }, Array.Empty<int>() }, new[] { 0, 1 });
        Assert.Contains("no tokens", Assert.Throws<ArgumentException>(() => BatchBuilder.Build(withEmpty, new[] { 0, 1 })).Message);
        Assert.Throws<ArgumentException>(() => BatchBuilder.Build(Set, new[] { 0 }, new PaddingOptions(PadTo.Fixed)));
        Assert.Throws<ArgumentException>(() => BatchBuilder.Build(Set, Array.Empty<int>()));
        Assert.Throws<ArgumentOutOfRangeException>(() => BatchBuilder.Build(Set, new[] { 4 }));
    }

    [Fact]
    public void Moving_to_the_device_it_is_on_returns_the_same_batch()
    {
        using var b = BatchBuilder.Build(Set, new[] { 0, 1 });
        Assert.Same(b, b.To(torch.CPU));
    }
}
