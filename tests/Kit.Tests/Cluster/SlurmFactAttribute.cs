namespace Kit.Tests.Cluster;

/// <summary>
/// A fact that needs a running Slurm cluster this machine can submit to. Without one it is skipped with a message
/// saying how to start one — unless KIT_REQUIRE_SLURM=1 (set by .ci/run), where it runs and fails, so a CI machine
/// that should have the scheduler cannot pass by skipping. Mirrors tests/Kit.Notebooks.Tests/RequiredTool.cs.
/// </summary>
public sealed class SlurmFactAttribute : FactAttribute
{
    public const string RequireVariable = "KIT_REQUIRE_SLURM";

    public const string Install = "as root, `bash .ci/slurm start` (installs Debian's slurmctld slurmd slurm-client munge, " +
        "writes a one-node /etc/slurm/slurm.conf and starts the daemons; `bash .ci/slurm stop` stops them)";

    static readonly Lazy<string?> s_problem = new(SlurmCluster.Problem);

    public static bool Required => Environment.GetEnvironmentVariable(RequireVariable) == "1";

    public SlurmFactAttribute()
    {
        if (s_problem.Value is { } problem && !Required)
            Skip = $"Skipped: {problem} Install: {Install}. Set {RequireVariable}=1 to make a missing cluster a failure.";
    }

    /// <summary>Inside a test: fails (never skips) when the cluster is not usable.</summary>
    public static void Demand()
    {
        if (s_problem.Value is { } problem)
            throw new Xunit.Sdk.XunitException($"{RequireVariable}=1 but Slurm is not usable: {problem} Install: {Install}.");
    }
}
