namespace Kit.Experiments;

/// <summary>
/// Which run of a sweep: config × training seed × fold. <see cref="Fold"/> is 1-based; a sweep on one fixed split
/// has Fold = 1 of Folds = 1. The <see cref="Id"/> is how the results store knows a run is finished.
/// </summary>
public sealed record RunKey(string Config, ulong Seed, int Fold, int Folds)
{
    public string Id => $"{Config}|seed={Seed}|fold={Fold}/{Folds}";
    public override string ToString() => Id;
}
