using CsCheck;
using Kit.Batching;
using Kit.Data;

namespace Kit.Tests.Batching;

public class BatchPlanTests
{
    static EncodedSet SetOfLengths(int[] lengths) =>
        EncodedSet.FromSequences(lengths.Select(l => Enumerable.Repeat(2, l).ToArray()).ToList(), lengths.Select(_ => 0).ToList());

    static void EveryRowOnce(EncodedSet set, IEnumerable<int[]> batches)
    {
        var seen = batches.SelectMany(b => b).OrderBy(r => r).ToArray();
        Assert.Equal(Enumerable.Range(0, set.Count).ToArray(), seen);
    }

    static IEnumerable<IBatchPlan> Plans(int batchSize, ulong seed) => new IBatchPlan[]
    {
        new InOrderBatches(batchSize),
        new ShuffledBatches(batchSize, seed),
        new LengthBuckets(batchSize, seed),
        new LengthBuckets(batchSize, seed, tokenBudget: 60),
        new LengthBuckets(batchSize, seed, boundaries: new[] { 3, 8 }),
    };

    [Fact]
    public void Every_batch_plan_yields_each_row_exactly_once_per_epoch_and_respects_the_batch_size()
    {
        Gen.Select(Gen.Int[1, 30].Array[0, 300], Gen.Int[1, 40], Gen.ULong).Sample((lengths, batchSize, seed) =>
        {
            var set = SetOfLengths(lengths);
            foreach (var plan in Plans(batchSize, seed))
                for (int epoch = 0; epoch < 2; epoch++)
                {
                    var batches = plan.Batches(set, epoch).ToList();
                    EveryRowOnce(set, batches);
                    Assert.All(batches, b => Assert.InRange(b.Length, 1, batchSize));
                }
        }, iter: 200);
    }

    [Fact]
    public void Same_seed_and_epoch_give_the_same_batches_and_another_epoch_reshuffles()
    {
        var set = SetOfLengths(Enumerable.Range(0, 500).Select(i => 1 + i % 23).ToArray());
        foreach (var plan in new IBatchPlan[] { new ShuffledBatches(16, 7), new LengthBuckets(16, 7) })
        {
            var a = plan.Batches(set, 3).ToList();
            var again = plan.Batches(set, 3).ToList();
            var next = plan.Batches(set, 4).ToList();
            Assert.Equal(a, again);
            Assert.NotEqual(a, next);
        }
    }

    [Fact]
    public void Bucket_members_are_reshuffled_between_epochs_not_only_the_batch_order()
    {
        // 400 rows of one length: a single bucket, so only shuffling inside it can change who shares a batch.
        var set = SetOfLengths(Enumerable.Repeat(6, 400).ToArray());
        var plan = new LengthBuckets(20, 9);
        static HashSet<string> Groups(IEnumerable<int[]> batches) => batches.Select(b => string.Join(",", b.Order())).ToHashSet();
        var first = Groups(plan.Batches(set, 0));
        var second = Groups(plan.Batches(set, 1));
        Assert.Equal(20, first.Count);
        Assert.True(first.Intersect(second).Count() < 2, "the same groups of rows came back in another epoch");
    }

    [Fact]
    public void Token_budget_caps_padded_positions_and_a_row_over_budget_is_named()
    {
        Gen.Select(Gen.Int[1, 30].Array[1, 200], Gen.Int[30, 200], Gen.ULong).Sample((lengths, budget, seed) =>
        {
            var set = SetOfLengths(lengths);
            var plan = new LengthBuckets(1000, seed, tokenBudget: budget);
            foreach (var b in plan.Batches(set, 0))
                Assert.True(b.Length * b.Max(r => lengths[r]) <= budget, $"batch of {b.Length} × {b.Max(r => lengths[r])} exceeds {budget}");
        }, iter: 200);

        var tooLong = SetOfLengths(new[] { 3, 12, 4 });
        var e = Assert.Throws<ArgumentException>(() => new LengthBuckets(8, 1, tokenBudget: 10).Batches(tooLong, 0).ToList());
        Assert.Contains("row 1", e.Message);
    }

    [Fact]
    public void Bucketed_batches_have_at_most_one_short_batch_and_near_uniform_lengths()
    {
        var random = new Random(11);
        var lengths = Enumerable.Range(0, 3000).Select(_ => 3 + (int)Math.Round(Math.Exp(random.NextDouble() * 3.3))).ToArray();
        var set = SetOfLengths(lengths);
        var batches = new LengthBuckets(32, 5).Batches(set, 0).ToList();
        Assert.True(batches.Count(b => b.Length < 32) <= 1);
        double bucketed = PadWaste.Measure(set, new LengthBuckets(32, 5));
        double naive = PadWaste.Measure(set, new ShuffledBatches(32, 5));
        Assert.True(bucketed < 0.05, $"bucketed pad waste {bucketed:P2}");
        Assert.True(naive > 4 * bucketed, $"naive {naive:P2} vs bucketed {bucketed:P2}");
    }

    [Fact]
    public void Explicit_boundaries_keep_full_batches_inside_one_bucket()
    {
        var lengths = Enumerable.Range(0, 400).Select(i => 1 + i % 20).ToArray();
        var set = SetOfLengths(lengths);
        int[] bounds = { 5, 10, 15 };
        int Bucket(int len) => bounds.Count(b => len > b);
        foreach (var b in new LengthBuckets(10, 3, boundaries: bounds).Batches(set, 0).Where(b => b.Length == 10))
            Assert.Single(b.Select(r => Bucket(lengths[r])).Distinct());
        Assert.Throws<ArgumentException>(() => new LengthBuckets(10, 3, boundaries: new[] { 5, 5 }));
    }

    [Fact]
    public void Automatic_boundaries_close_a_bucket_once_it_holds_a_batch()
    {
        // lengths 1×3, 2×1, 3×4, 4×1 with batch size 4: {1,2} holds 4, {3} holds 4, {4} is the open tail.
        var b = LengthBuckets.AutomaticBoundaries(new[] { 1, 1, 1, 2, 3, 3, 3, 3, 4 }, 4, 4);
        Assert.Equal(new[] { 2, 3 }, b);
    }

    [Fact]
    public void Pad_waste_is_pad_positions_over_all_positions()
    {
        // Hand count: batches {1,3} and {2,2}: positions 2×3 + 2×2 = 10, pads 2 + 0 = 2.
        var set = SetOfLengths(new[] { 1, 3, 2, 2 });
        Assert.Equal(0.2, PadWaste.Measure(set, new InOrderBatches(2)), 12);
        Assert.Equal(0.0, PadWaste.Measure(set, new InOrderBatches(1)), 12);
    }
}
