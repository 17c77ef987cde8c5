namespace Kit.Tests.Training;

/// <summary>
/// Tests that compare two training runs bit for bit. The engine's random generator is process-wide, so another
/// test seeding or drawing from it at the same time would make equal runs differ; this collection runs alone.
/// </summary>
[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class EngineRandomCollection
{
    public const string Name = "engine random state";
}
