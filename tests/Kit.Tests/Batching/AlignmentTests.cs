using Kit.Batching;
using Kit.Data;
using TorchSharp;

namespace Kit.Tests.Batching;

public class AlignmentTests
{
    public AlignmentTests() => TestEngine.Load();

    static readonly EncodedSet Set = EncodedSet.FromSequences(
        new[] { new[] { 2, 3, 4 }, new[] { 5, 6 }, new[] { 7, 8, 9, 10 }, new[] { 11 } }, new[] { 0, 0, 0, 0 });

    [Fact]
    public void Left_and_right_padded_batches_convert_into_each_other()
    {
        int[] rows = { 0, 1, 2, 3 };
        using var right = BatchBuilder.Build(Set, rows);
        using var left = BatchBuilder.Build(Set, rows, new PaddingOptions(Side: PadSide.Left));
        using var toRight = Alignment.LeftToRight(left.Tokens, left.Lengths);
        using var toLeft = Alignment.RightToLeft(right.Tokens, right.Lengths);
        Assert.Equal(right.Tokens.data<long>().ToArray(), toRight.data<long>().ToArray());
        Assert.Equal(left.Tokens.data<long>().ToArray(), toLeft.data<long>().ToArray());
    }

    [Fact]
    public void Reversing_the_valid_part_leaves_pads_in_place_and_undoes_itself()
    {
        using var b = BatchBuilder.Build(Set, new[] { 0, 1, 2, 3 });
        using var reversed = Alignment.ReverseValid(b.Tokens, b.Lengths);
        Assert.Equal(new long[] { 4, 3, 2, 0, 6, 5, 0, 0, 10, 9, 8, 7, 11, 0, 0, 0 }, reversed.data<long>().ToArray());
        using var twice = Alignment.ReverseValid(reversed, b.Lengths);
        Assert.Equal(b.Tokens.data<long>().ToArray(), twice.data<long>().ToArray());

        using var features = torch.arange(16 * 3, torch.ScalarType.Float32).view(4, 4, 3);
        using var reversedFeatures = Alignment.ReverseValid(features, b.Lengths);
        Assert.Equal(features[0, 2].data<float>().ToArray(), reversedFeatures[0, 0].data<float>().ToArray());
        Assert.Equal(features[1, 3].data<float>().ToArray(), reversedFeatures[1, 3].data<float>().ToArray());
    }

    [Fact]
    public void The_valid_mask_matches_the_builder_mask()
    {
        using var b = BatchBuilder.Build(Set, new[] { 3, 2, 0 });
        using var mask = Alignment.ValidMask(b.Lengths, b.Steps);
        Assert.Equal(b.Mask.data<bool>().ToArray(), mask.data<bool>().ToArray());
    }
}
