namespace Kit.Data;

/// <summary>
/// What to do with a row that cannot be used. Refuse stops at the first one with a located <see cref="DataError"/>.
/// Skip drops such rows and counts them by reason in <see cref="LabelledTable.SkipReport"/>. Problems of the
/// whole file (invalid UTF-8, NUL bytes, an unterminated quote, a missing header or column, an empty file) are
/// never skippable, because no row after them can be trusted.
/// </summary>
public enum RowPolicy
{
    Refuse,
    Skip,
}
