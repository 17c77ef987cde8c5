namespace Kit.Batching;

/// <summary>How long a padded batch is: as long as its longest row, or a fixed number of steps.</summary>
public enum PadTo { BatchMax, Fixed }

/// <summary>Which end of a row the pad ids go to. Right keeps step 0 = first token for every row.</summary>
public enum PadSide { Right, Left }

/// <summary>
/// Padding of one batch. With <see cref="PadTo.Fixed"/> a row longer than <paramref name="FixedLength"/> is an
/// error unless <paramref name="Truncate"/> is set, in which case its leading tokens are kept.
/// </summary>
public sealed record PaddingOptions(PadTo To = PadTo.BatchMax, int? FixedLength = null, PadSide Side = PadSide.Right, bool Truncate = false)
{
    public static PaddingOptions Default { get; } = new();

    internal void Validate()
    {
        if (To == PadTo.Fixed && FixedLength is not > 0)
            throw new ArgumentException($"PadTo.Fixed needs a positive FixedLength (got {FixedLength?.ToString() ?? "none"})");
        if (To == PadTo.BatchMax && FixedLength is not null)
            throw new ArgumentException("FixedLength is only used with PadTo.Fixed; drop it or set To = PadTo.Fixed");
        if (Truncate && To != PadTo.Fixed)
            throw new ArgumentException("Truncate only applies with PadTo.Fixed");
    }
}
