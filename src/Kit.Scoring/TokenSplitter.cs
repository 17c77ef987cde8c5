namespace Kit.Scoring;

/// <summary>
/// Cuts text into the token strings the exporting run's vocabulary knows. Implemented here again (this package
/// does not reference the kit) to the written rules of the kit's character, word and byte tokenizers; a test
/// checks both give the same ids on the demo data.
/// </summary>
internal abstract class TokenSplitter
{
    public abstract IReadOnlyList<string> Split(string text);

    public static TokenSplitter For(string kind, bool foldCase, bool lowerCase, string source) => kind switch
    {
        "character" => new CharacterSplitter(foldCase),
        "word" => new WordSplitter(lowerCase),
        "byte" => new ByteSplitter(),
        "delegate" => throw new ScoringModelError(source, "the model was trained with a user-supplied tokenizer function, which cannot travel in a side-car"),
        _ => throw new ScoringModelError(source, $"unknown tokenizer kind '{kind}' (this library knows character, word and byte)"),
    };
}
