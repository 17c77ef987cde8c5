using Kit.Batching;
using Kit.Data;

namespace Kit.Training;

/// <summary>Why a row got no prediction.</summary>
public enum ScoreFlag
{
    None,
    /// <summary>The tokenizer found no tokens in the text.</summary>
    Empty,
    /// <summary>Every token is outside the model's vocabulary, so the model would only echo its class prior.</summary>
    AllUnknown,
}

/// <summary>Scores of raw texts: per row a predicted class id (−1 when flagged) and class probabilities (null when flagged).</summary>
public sealed record TextScores(int[] Predicted, double[]?[] Probabilities, ScoreFlag[] Flags, int[] Tokens, bool[] Truncated)
{
    public int Count => Predicted.Length;
    public int FlaggedCount => Flags.Count(f => f != ScoreFlag.None);
    /// <summary>Tokens of each row before truncation (what a drift check compares lengths by); empty when not counted.</summary>
    public int[] RawTokens { get; init; } = [];
    /// <summary>Unknown tokens among those kept, per row; empty when not counted.</summary>
    public int[] UnknownTokens { get; init; } = [];
}

/// <summary>Encodes texts as the bundle's training run did and scores them with its model (and temperature, when set).</summary>
public static class TextScorer
{
    public static TextScores Score(ModelBundle bundle, IReadOnlyList<string> texts, int batchSize = 512)
    {
        var tokenizer = bundle.Tokenizer.Create();
        // Split once: the same pieces give the encoded rows, the truncation marks and the drift counts.
        var pieces = texts.Select(tokenizer.Split).ToArray();
        var (set, _) = Encoder.EncodePieces(pieces, new int[texts.Count], bundle.Vocabulary, bundle.MaxLength, bundle.Truncation);
        var flags = new ScoreFlag[texts.Count];
        var truncated = new bool[texts.Count];
        var tokens = new int[texts.Count];
        var raw = new int[texts.Count];
        var unknown = new int[texts.Count];
        var usable = new List<int>(texts.Count);
        for (int i = 0; i < texts.Count; i++)
        {
            var seq = set[i];
            tokens[i] = seq.Length;
            raw[i] = pieces[i].Count;
            truncated[i] = raw[i] > bundle.MaxLength;
            bool anyKnown = false;
            foreach (int id in seq)
            {
                anyKnown |= id != BatchBuilder.UnknownId;
                if (id == BatchBuilder.UnknownId) unknown[i]++;
            }
            flags[i] = seq.Length == 0 ? ScoreFlag.Empty : anyKnown ? ScoreFlag.None : ScoreFlag.AllUnknown;
            if (flags[i] == ScoreFlag.None) usable.Add(i);
        }
        var predicted = Enumerable.Repeat(-1, texts.Count).ToArray();
        var probabilities = new double[]?[texts.Count];
        if (usable.Count > 0)
        {
            var logits = Scoring.Logits(bundle.Model, set.Subset(usable), batchSize);
            var p = Scoring.Softmax(logits, bundle.Temperature ?? 1.0);
            for (int k = 0; k < usable.Count; k++)
            {
                probabilities[usable[k]] = p[k];
                predicted[usable[k]] = Array.IndexOf(p[k], p[k].Max());
            }
        }
        return new TextScores(predicted, probabilities, flags, tokens, truncated) { RawTokens = raw, UnknownTokens = unknown };
    }
}
