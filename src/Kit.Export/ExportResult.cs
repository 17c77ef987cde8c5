namespace Kit.Export;

/// <summary>
/// What an export wrote. <see cref="Browser"/> is the executable used, or null when none was found (then
/// only HTML was written and <see cref="Message"/> says what to install).
/// </summary>
public sealed record ExportResult(IReadOnlyList<string> Files, string? Browser, string Message)
{
    public bool ImagesWritten => Browser is not null && Files.Any(f => f.EndsWith(".png", StringComparison.OrdinalIgnoreCase));
}
