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

    // Slurm job arrays: SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_MIN, SLURM_ARRAY_TASK_MAX and SLURM_ARRAY_TASK_COUNT
    // are the variables the sbatch manual page lists under "OUTPUT ENVIRONMENT VARIABLES" for --array jobs.
    [Fact]
    public void Slurm_array_variables_give_index_and_count()
    {
        // --array=3-6: task 5 is the third of four.
        Assert.Equal(new Shard(3, 4), Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "5"), ("SLURM_ARRAY_TASK_MIN", "3"), ("SLURM_ARRAY_TASK_MAX", "6"))));
        // COUNT wins over MAX − MIN + 1 (they differ for an array with a step).
        Assert.Equal(new Shard(1, 2), Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "0"), ("SLURM_ARRAY_TASK_MIN", "0"), ("SLURM_ARRAY_TASK_MAX", "2"), ("SLURM_ARRAY_TASK_COUNT", "2"))));
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
