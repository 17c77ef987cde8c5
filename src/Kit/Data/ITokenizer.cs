namespace Kit.Data;

/// <summary>Cuts a text into token strings; a <see cref="Vocabulary"/> turns those into ids.</summary>
public interface ITokenizer
{
    /// <summary>A short stable name, shown in reports and stored in a <see cref="TokenizerSpec"/>.</summary>
    string Name { get; }
    IReadOnlyList<string> Split(string text);
}
