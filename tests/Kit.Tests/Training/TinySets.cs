using Kit.Common;
using Kit.Data;
using Kit.Models;

namespace Kit.Tests.Training;

/// <summary>
/// Small seeded token sequences for exercising the loop's mechanics (not for claims about accuracy): the class is
/// which of three marker tokens appears most, so a recurrent model can learn it within a few epochs.
/// </summary>
internal static class TinySets
{
    public const int Vocabulary = 12, Classes = 3;

    public static EncodedSet Make(int rows, ulong seed)
    {
        var rng = new SplitMix64(seed);
        var sequences = new List<int[]>();
        var labels = new List<int>();
        for (int r = 0; r < rows; r++)
        {
            int label = rng.NextInt(Classes);
            int length = 3 + rng.NextInt(6);
            var seq = new int[length];
            for (int t = 0; t < length; t++)
                seq[t] = rng.NextInt(3) == 0 ? 2 + label : 5 + rng.NextInt(Vocabulary - 5);
            seq[rng.NextInt(length)] = 2 + label;
            sequences.Add(seq);
            labels.Add(label);
        }
        return EncodedSet.FromSequences(sequences, labels);
    }

    public static ClassifierConfig Config(CellKind cell = CellKind.Gru) =>
        new(Vocabulary, Classes, cell, EmbeddingSize: 8, HiddenSize: 12, HeadDropout: 0.1);

    public static SequenceClassifier Model(long initSeed = 3, CellKind cell = CellKind.Gru)
    {
        Kit.Native.Engine.EnsureLoaded();
        TorchSharp.torch.manual_seed(initSeed);
        return Config(cell).Build();
    }

    /// <summary>Every weight as raw float bits, keyed by name, to compare models exactly.</summary>
    public static Dictionary<string, float[]> Weights(SequenceClassifier model) =>
        model.state_dict().ToDictionary(kv => kv.Key, kv => kv.Value.detach().cpu().contiguous().data<float>().ToArray());

    public static void AssertSameWeights(SequenceClassifier a, SequenceClassifier b)
    {
        var wa = Weights(a);
        var wb = Weights(b);
        Assert.Equal(wa.Keys.OrderBy(k => k), wb.Keys.OrderBy(k => k));
        foreach (var (name, values) in wa)
            Assert.True(values.SequenceEqual(wb[name]), $"weight '{name}' differs");
    }

    /// <summary>The history without wall time and throughput, which are the only fields allowed to differ.</summary>
    public static List<EpochNumbers> Numbers(Kit.Training.TrainingHistory h) =>
        h.Epochs.Select(e => new EpochNumbers(e.Epoch, e.TrainLoss, e.TrainAccuracy, e.ValidationLoss, e.ValidationAccuracy,
            e.ValidationMacroF1, e.LearningRate, e.MeanGradientNorm, e.ClippedBatches)).ToList();

    public sealed record EpochNumbers(int Epoch, double TrainLoss, double TrainAccuracy, double ValidationLoss, double ValidationAccuracy,
        double ValidationMacroF1, double LearningRate, double MeanGradientNorm, int ClippedBatches);
}
