using Kit.Export;

namespace Kit.Tests.Export;

/// <summary>
/// A fact that needs a local Chromium. Without one it is skipped with a message saying what to install — unless
/// KIT_REQUIRE_BROWSER=1, where it runs and fails, so a CI machine that should have the browser cannot pass quietly.
/// </summary>
public sealed class BrowserFactAttribute : FactAttribute
{
    public const string RequireVariable = "KIT_REQUIRE_BROWSER";

    public static bool Required => Environment.GetEnvironmentVariable(RequireVariable) == "1";

    public BrowserFactAttribute()
    {
        if (HeadlessBrowser.Locate() is null && !Required)
            Skip = $"Skipped: {HeadlessBrowser.NotFoundMessage} Set {RequireVariable}=1 to make a missing browser a failure.";
    }

    /// <summary>The browser to use inside such a test; fails (never skips) when it is missing.</summary>
    public static string Browser() =>
        HeadlessBrowser.Locate() ?? throw new Xunit.Sdk.XunitException($"{RequireVariable}=1 but {HeadlessBrowser.NotFoundMessage}");
}
