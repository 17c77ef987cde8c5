namespace Kit.Notebooks.Tests;

/// <summary>Skip or fail: a missing tool skips with an install hint, unless its KIT_REQUIRE_* variable asks for a failure.</summary>
public class RequiredToolTests
{
    [Fact]
    public void A_missing_tool_skips_with_what_to_install_unless_required_then_it_fails()
    {
        string variable = $"KIT_REQUIRE_TEST_{Guid.NewGuid():N}";
        var missing = new RequiredTool(variable, "apt-get install something", () => "something is not on PATH.");
        var present = new RequiredTool(variable + "_OK", "nothing", () => null);
        try
        {
            string? reason = RequiredTool.SkipReason(missing, present);
            Assert.NotNull(reason);
            Assert.Contains("something is not on PATH.", reason);
            Assert.Contains("Install: apt-get install something", reason);
            Assert.Contains($"Set {variable}=1", reason);
            Assert.Null(RequiredTool.SkipReason(present));

            Environment.SetEnvironmentVariable(variable, "1");
            Assert.Null(RequiredTool.SkipReason(missing, present));
            var failure = Assert.Throws<Xunit.Sdk.XunitException>(missing.Demand);
            Assert.Contains($"{variable}=1", failure.Message);
            Assert.Contains("apt-get install something", failure.Message);
            present.Demand();
        }
        finally
        {
            Environment.SetEnvironmentVariable(variable, null);
        }
    }
}
