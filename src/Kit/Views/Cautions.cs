namespace Kit.Views;

/// <summary>The cautions every report and the README carry; where use can hurt someone, local law and review decide.</summary>
public static class Cautions
{
    public static readonly IReadOnlyList<string> Lines = new[]
    {
        "A classifier's probability is not ground truth; check calibration before using scores as thresholds.",
        "Do not use these models to infer protected attributes of people (origin, ethnicity, gender) from names or text; such uses can be unlawful and harmful. Follow applicable law and your organisation's review process.",
        "Security use (hostname triage) supports an analyst; it is not a sole basis for blocking.",
    };
}
