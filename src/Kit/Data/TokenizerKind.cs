namespace Kit.Data;

/// <summary>The token unit of a run: one character, one UTF-8 byte, or one word.</summary>
public enum TokenizerKind { Character, Byte, Word }
