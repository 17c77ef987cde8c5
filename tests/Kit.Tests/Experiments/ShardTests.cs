using Kit.Experiments;

namespace Kit.Tests.Experiments;

public class ShardTests
{
    static Func<string, string?> Env(params (string Key, string Value)[] vars)
    {
        var map = vars.ToDictionary(v => v.Key, v => v.Value);
        return k => map.GetValueOrDefault(k);
    }

    [Fact]
    public void Explicit_shards_parse_and_split_positions_round_robin()
    {
        Assert.Equal(new Shard(2, 4), Shard.Parse("2/4"));
        var shards = Enumerable.Range(1, 3).Select(i => new Shard(i, 3)).ToArray();
        for (int p = 0; p < 20; p++) Assert.Single(shards, s => s.Owns(p));
        Assert.Equal("runs.shard-2-of-3.jsonl", shards[1].FileName);
        Assert.Equal(ResultsStore.MainFile, Shard.Whole.FileName);
        Assert.Contains("outside 1..4", Assert.Throws<ArgumentException>(() => Shard.Parse("0/4")).Message);
        Assert.Contains("outside 1..4", Assert.Throws<ArgumentException>(() => Shard.Parse("5/4")).Message);
        Assert.Contains("should be i/N", Assert.Throws<ArgumentException>(() => Shard.Parse("3")).Message);
    }

    // Slurm job arrays (Slurm documentation, "Job Array Support"): every task gets SLURM_ARRAY_TASK_ID, and
    // SLURM_ARRAY_TASK_MIN, _MAX, _STEP and _COUNT describe the array (the full list of names from memory of that
    // page and the sbatch manual's OUTPUT ENVIRONMENT VARIABLES).
    [Fact]
    public void Slurm_array_variables_give_index_and_count()
    {
        // --array=3-6: task 5 is the third of four.
        Assert.Equal(new Shard(3, 4), Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "5"), ("SLURM_ARRAY_TASK_MIN", "3"), ("SLURM_ARRAY_TASK_MAX", "6"))));
        // COUNT wins over MAX − MIN + 1 (they differ for an array with a step).
        Assert.Equal(new Shard(1, 2), Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "0"), ("SLURM_ARRAY_TASK_MIN", "0"), ("SLURM_ARRAY_TASK_MAX", "2"), ("SLURM_ARRAY_TASK_COUNT", "2"))));
        // --array=1-19:2 (step 2): task 7 is the fourth of ten.
        Assert.Equal(new Shard(4, 10), Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "7"), ("SLURM_ARRAY_TASK_MIN", "1"), ("SLURM_ARRAY_TASK_MAX", "19"), ("SLURM_ARRAY_TASK_STEP", "2"))));
        Assert.Contains("not on the array's range", Assert.Throws<ArgumentException>(() =>
            Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "4"), ("SLURM_ARRAY_TASK_MIN", "1"), ("SLURM_ARRAY_TASK_MAX", "19"), ("SLURM_ARRAY_TASK_STEP", "2")))).Message);
        // --array=1,4,9 (a list): COUNT is 3 but id 9 is off the range 1..3.
        Assert.Contains("outside 1..3", Assert.Throws<ArgumentException>(() =>
            Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "9"), ("SLURM_ARRAY_TASK_MIN", "1"), ("SLURM_ARRAY_TASK_MAX", "9"), ("SLURM_ARRAY_TASK_COUNT", "3")))).Message);
        Assert.Contains("has 4 tasks", Assert.Throws<ArgumentException>(() =>
            Shard.Parse("auto/3", Env(("SLURM_ARRAY_TASK_ID", "1"), ("SLURM_ARRAY_TASK_MIN", "1"), ("SLURM_ARRAY_TASK_MAX", "4")))).Message);
        Assert.Contains("SLURM_ARRAY_TASK_COUNT", Assert.Throws<ArgumentException>(() => Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "1")))).Message);
    }

    // Kubernetes Indexed Jobs: completionMode: Indexed sets JOB_COMPLETION_INDEX (0-based) in each pod; the count is
    // the Job's spec.completions, which pods are not told, hence auto/N (Kubernetes documentation, "Jobs", Indexed Job).
    [Fact]
    public void Kubernetes_completion_index_needs_the_count_on_the_command_line()
    {
        Assert.Equal(new Shard(3, 3), Shard.Parse("auto/3", Env(("JOB_COMPLETION_INDEX", "2"))));
        Assert.Equal(new Shard(1, 3), Shard.Parse("auto/3", Env(("JOB_COMPLETION_INDEX", "0"))));
        Assert.Contains("auto/N", Assert.Throws<ArgumentException>(() => Shard.Parse("auto", Env(("JOB_COMPLETION_INDEX", "0")))).Message);
        Assert.Contains("outside 1..3", Assert.Throws<ArgumentException>(() => Shard.Parse("auto/3", Env(("JOB_COMPLETION_INDEX", "3")))).Message);
        Assert.Contains("found no array-job variables", Assert.Throws<ArgumentException>(() => Shard.Parse("auto/3", Env())).Message);
    }
}
