using Kit.Views;

namespace Kit.Notebooks.Tests;

/// <summary>
/// An outside program a test needs (a real notebook client, a browser). Without it the test is skipped with a
/// message saying what to install — unless the tool's KIT_REQUIRE_* variable is 1, as CI sets it, where the test
/// runs and fails, so a machine that should have the tool cannot pass by skipping.
/// </summary>
public sealed class RequiredTool
{
    public string Variable { get; }
    public string Install { get; }
    readonly Lazy<string?> _problem;

    internal RequiredTool(string variable, string install, Func<string?> problem)
    {
        Variable = variable;
        Install = install;
        _problem = new Lazy<string?>(problem);
    }

    public static RequiredTool Jupyter { get; } = new("KIT_REQUIRE_JUPYTER",
        "apt-get install jupyter-client python3-nbconvert python3-nbclient python3-ipykernel; " +
        "dotnet tool install -g Microsoft.dotnet-interactive --version 1.0.712001; dotnet interactive jupyter install",
        () => JupyterClient.Problem());

    public static RequiredTool Browser { get; } = new("KIT_REQUIRE_BROWSER", "apt-get install chromium (or set KIT_CHROMIUM to a Chromium executable)",
        () => HeadlessBrowser.Locate() is null ? HeadlessBrowser.NotFoundMessage : null);

    public bool Required => Environment.GetEnvironmentVariable(Variable) == "1";

    /// <summary>Why the tool cannot be used here, or null when it can.</summary>
    public string? Problem => _problem.Value;

    /// <summary>The skip reason for a test needing these tools, or null when it should run.</summary>
    public static string? SkipReason(params RequiredTool[] tools)
    {
        var missing = tools.Where(t => t.Problem is not null && !t.Required).ToArray();
        return missing.Length == 0 ? null : string.Join(" ", missing.Select(t =>
            $"Skipped: {t.Problem} Install: {t.Install}. Set {t.Variable}=1 to make a missing tool a failure."));
    }

    /// <summary>Inside a test: fails (never skips) when the tool is missing.</summary>
    public void Demand()
    {
        if (Problem is { } p) throw new Xunit.Sdk.XunitException($"{Variable}=1 but the tool is not usable: {p} Install: {Install}.");
    }
}

/// <summary>A fact that needs the real Jupyter client with the .NET kernel.</summary>
public sealed class JupyterFactAttribute : FactAttribute
{
    public JupyterFactAttribute() => Skip = RequiredTool.SkipReason(RequiredTool.Jupyter);
}

/// <summary>A theory that needs the real Jupyter client with the .NET kernel.</summary>
public sealed class JupyterTheoryAttribute : TheoryAttribute
{
    public JupyterTheoryAttribute() => Skip = RequiredTool.SkipReason(RequiredTool.Jupyter);
}

/// <summary>A fact that needs a local Chromium.</summary>
public sealed class BrowserFactAttribute : FactAttribute
{
    public BrowserFactAttribute() => Skip = RequiredTool.SkipReason(RequiredTool.Browser);
}

/// <summary>A fact that needs both the Jupyter client and a local Chromium.</summary>
public sealed class JupyterAndBrowserFactAttribute : FactAttribute
{
    public JupyterAndBrowserFactAttribute() => Skip = RequiredTool.SkipReason(RequiredTool.Jupyter, RequiredTool.Browser);
}
