using System.Globalization;

namespace Kit.Experiments;

/// <summary>
/// Which share of a sweep this process runs: shard <see cref="Index"/> of <see cref="Count"/> (1-based) takes
/// the runs at positions p with p mod Count = Index − 1 of the sweep's fixed run order, so shards never overlap
/// and together cover every run whatever order they are started in.
/// </summary>
public sealed record Shard(int Index, int Count)
{
    public static Shard Whole { get; } = new(1, 1);

    public bool IsWhole => Count == 1;

    public bool Owns(int position) => position % Count == Index - 1;

    /// <summary>The store file this shard writes (the unsharded store for the whole sweep).</summary>
    public string FileName => IsWhole ? ResultsStore.MainFile : $"runs.shard-{Index}-of-{Count}.jsonl";

    public override string ToString() => $"{Index}/{Count}";

    /// <summary>
    /// "i/N" (1 ≤ i ≤ N), or "auto" / "auto/N" to read the index from a scheduler's array-job variables (see
    /// <see cref="FromEnvironment"/>); N after "auto" is the count where the scheduler does not give one.
    /// </summary>
    public static Shard Parse(string text, Func<string, string?>? environment = null)
    {
        text = text.Trim();
        if (text == "auto") return FromEnvironment(environment ?? Environment.GetEnvironmentVariable, null);
        if (text.StartsWith("auto/", StringComparison.Ordinal))
            return FromEnvironment(environment ?? Environment.GetEnvironmentVariable, Number(text[5..], "shard count in 'auto/N'"));
        int slash = text.IndexOf('/');
        if (slash < 0) throw new ArgumentException($"--shard '{text}' should be i/N (e.g. 2/4), auto or auto/N");
        int index = Number(text[..slash], "shard index"), count = Number(text[(slash + 1)..], "shard count");
        return Checked(index, count, $"--shard {text}");
    }

    /// <summary>
    /// The index from array-job conventions. Slurm: SLURM_ARRAY_TASK_ID counted from SLURM_ARRAY_TASK_MIN in steps
    /// of SLURM_ARRAY_TASK_STEP (so --array=0-9 and --array=1-19:2 both give shards 1..10), with the count from
    /// SLURM_ARRAY_TASK_COUNT or (MAX − MIN) / STEP + 1. An array given as a list (--array=1,4,9) cannot be mapped
    /// and is refused when an id falls off the range. A Kubernetes Indexed Job: the 0-based JOB_COMPLETION_INDEX,
    /// with the count given by the caller (the Job's completions, which pods are not told).
    /// </summary>
    public static Shard FromEnvironment(Func<string, string?> environment, int? count)
    {
        string? slurmId = environment("SLURM_ARRAY_TASK_ID");
        if (!string.IsNullOrEmpty(slurmId))
        {
            int id = Number(slurmId, "SLURM_ARRAY_TASK_ID");
            int min = environment("SLURM_ARRAY_TASK_MIN") is { Length: > 0 } m ? Number(m, "SLURM_ARRAY_TASK_MIN") : 0;
            int step = environment("SLURM_ARRAY_TASK_STEP") is { Length: > 0 } st ? Number(st, "SLURM_ARRAY_TASK_STEP") : 1;
            if (step < 1) throw new ArgumentException($"SLURM_ARRAY_TASK_STEP={step} must be positive");
            if ((id - min) % step != 0) throw new ArgumentException($"SLURM_ARRAY_TASK_ID={id} is not on the array's range {min}, {min + step}, …; use --array=A-B[:STEP]");
            int? n = environment("SLURM_ARRAY_TASK_COUNT") is { Length: > 0 } c ? Number(c, "SLURM_ARRAY_TASK_COUNT")
                : environment("SLURM_ARRAY_TASK_MAX") is { Length: > 0 } max ? (Number(max, "SLURM_ARRAY_TASK_MAX") - min) / step + 1
                : null;
            n ??= count ?? throw new ArgumentException("--shard auto under Slurm needs SLURM_ARRAY_TASK_COUNT or SLURM_ARRAY_TASK_MAX (or give auto/N)");
            if (count is int given && given != n)
                throw new ArgumentException($"--shard auto/{given} but the Slurm array has {n} tasks");
            return Checked((id - min) / step + 1, n.Value, $"SLURM_ARRAY_TASK_ID={id} (min {min}, step {step})");
        }
        string? k8s = environment("JOB_COMPLETION_INDEX");
        if (!string.IsNullOrEmpty(k8s))
        {
            int index = Number(k8s, "JOB_COMPLETION_INDEX");
            if (count is null) throw new ArgumentException("JOB_COMPLETION_INDEX is set but the Job's completion count is not: give --shard auto/N");
            return Checked(index + 1, count.Value, $"JOB_COMPLETION_INDEX={index}");
        }
        throw new ArgumentException("--shard auto found no array-job variables (SLURM_ARRAY_TASK_ID or JOB_COMPLETION_INDEX); give --shard i/N");
    }

    static Shard Checked(int index, int count, string source)
    {
        if (count < 1) throw new ArgumentException($"{source}: shard count {count} must be at least 1");
        if (index < 1 || index > count) throw new ArgumentException($"{source}: shard {index} is outside 1..{count}");
        return new Shard(index, count);
    }

    static int Number(string s, string what) =>
        int.TryParse(s.Trim(), NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out int v) ? v
            : throw new ArgumentException($"{what} '{s}' is not an integer");
}
