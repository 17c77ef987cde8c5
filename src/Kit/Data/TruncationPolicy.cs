namespace Kit.Data;

/// <summary>
/// Which tokens survive when a sequence is longer than the maximum length. HeadAndTail keeps the first
/// ceil(max/2) and the last floor(max/2) tokens: the start and end of a hostname or log line often carry the
/// most signal.
/// </summary>
public enum TruncationPolicy
{
    KeepHead,
    KeepTail,
    HeadAndTail,
}
