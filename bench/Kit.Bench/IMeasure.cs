namespace Kit.Bench;

/// <summary>One figure the harness reports: a ratio or a time measured in this process, against its reference.</summary>
public sealed record Figure(string Id, double Value, string Unit, string Goal, string HowMeasured);

/// <summary>
/// A benchmark measure. Implementations live next to the layer they measure (bench/Kit.Bench/&lt;Layer&gt;/)
/// and are listed in <see cref="MeasureCatalog"/>. A measure that compares against a reference runs both in
/// the same process run, interleaved where it can, because these machines are noisy.
/// </summary>
public interface IMeasure
{
    /// <summary>The ids this measure produces (one measure may produce several related figures).</summary>
    IReadOnlyList<string> Ids { get; }
    IEnumerable<Figure> Run();
}
