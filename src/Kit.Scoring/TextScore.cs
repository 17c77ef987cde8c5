namespace Kit.Scoring;

/// <summary>Why a row got no prediction.</summary>
public enum RowFlag
{
    None,
    /// <summary>The tokenizer found no tokens in the text.</summary>
    Empty,
    /// <summary>Every token is outside the vocabulary, so the model would only echo its class prior.</summary>
    AllUnknown,
}

/// <summary>
/// One scored text: the predicted label and class id (null / −1 when flagged), probabilities per label in
/// <see cref="ScoringModel.Labels"/> order (null when flagged), tokens kept and found, unknown tokens among those
/// kept, and whether the text was cut to the model's maximum length by its truncation policy.
/// </summary>
public sealed record TextScore(string? Label, int ClassId, float[]? Probabilities, RowFlag Flag, int Tokens, int RawTokens, int UnknownTokens, bool Truncated)
{
    /// <summary>The top probability (the model's confidence), NaN when flagged.</summary>
    public double Confidence => Probabilities is null ? double.NaN : Probabilities.Max();
}
