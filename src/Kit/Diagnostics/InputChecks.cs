using System.Globalization;

namespace Kit.Diagnostics;

/// <summary>
/// Argument checks shared by every diagnostic. Each failure names the argument, the offending index and the
/// value, because these arrays usually come from a long pipeline and "invalid input" alone is not debuggable.
/// </summary>
internal static class InputChecks
{
    /// <summary>
    /// How far a probability row may sum away from 1. Float32 softmax over a few hundred classes drifts by about
    /// 1e-6; 1e-4 admits that and still catches logits or unnormalised scores passed by mistake
    /// (common practice, no source).
    /// </summary>
    public const double ProbabilitySumTolerance = 1e-4;

    public static void NotEmpty<T>(IReadOnlyCollection<T>? values, string name)
    {
        ArgumentNullException.ThrowIfNull(values, name);
        if (values.Count == 0) throw new ArgumentException($"{name} is empty; at least one example is needed.", name);
    }

    public static void SameLength(int expected, string expectedName, int actual, string actualName)
    {
        if (expected != actual)
            throw new ArgumentException(
                $"{actualName} has {actual} entries but {expectedName} has {expected}; they must describe the same examples.", actualName);
    }

    public static void ClassNames(IReadOnlyList<string>? classNames)
    {
        ArgumentNullException.ThrowIfNull(classNames, nameof(classNames));
        if (classNames.Count == 0) throw new ArgumentException("classNames is empty; at least one class is needed.", nameof(classNames));
        var seen = new HashSet<string>(StringComparer.Ordinal);
        for (int i = 0; i < classNames.Count; i++)
        {
            if (classNames[i] is null) throw new ArgumentException($"classNames[{i}] is null.", nameof(classNames));
            if (!seen.Add(classNames[i])) throw new ArgumentException($"classNames[{i}] \"{classNames[i]}\" appears twice.", nameof(classNames));
        }
    }

    public static void Labels(int[] labels, int classCount, string name = "labels")
    {
        for (int i = 0; i < labels.Length; i++)
            if ((uint)labels[i] >= (uint)classCount)
                throw new ArgumentOutOfRangeException(name,
                    $"{name}[{i}] = {labels[i]} is outside the {classCount} classes (valid: 0..{classCount - 1}).");
    }

    /// <summary>Rows must have one finite entry per class in [0, 1] and sum to 1 within <see cref="ProbabilitySumTolerance"/>.</summary>
    public static void Probabilities(double[][] probabilities, int classCount, string name = "probabilities")
    {
        for (int i = 0; i < probabilities.Length; i++)
        {
            var row = probabilities[i] ?? throw new ArgumentException($"{name}[{i}] is null.", name);
            if (row.Length != classCount)
                throw new ArgumentException($"{name}[{i}] has {row.Length} entries but there are {classCount} classes.", name);
            double sum = 0;
            for (int k = 0; k < row.Length; k++)
            {
                double p = row[k];
                if (!double.IsFinite(p) || p < -1e-12 || p > 1 + 1e-12)
                    throw new ArgumentException($"{name}[{i}][{k}] = {Show(p)} is not a probability in [0, 1].", name);
                sum += p;
            }
            if (Math.Abs(sum - 1) > ProbabilitySumTolerance)
                throw new ArgumentException(
                    $"{name}[{i}] sums to {Show(sum)}, not 1 (tolerance {ProbabilitySumTolerance}); pass softmax outputs, not logits or scores.", name);
        }
    }

    public static void FiniteMatrix(double[][] x, string name, int? columns = null)
    {
        ArgumentNullException.ThrowIfNull(x, name);
        if (x.Length == 0) throw new ArgumentException($"{name} is empty; at least one row is needed.", name);
        int d = columns ?? (x[0] ?? throw new ArgumentException($"{name}[0] is null.", name)).Length;
        if (d == 0) throw new ArgumentException($"{name}[0] has no columns.", name);
        for (int i = 0; i < x.Length; i++)
        {
            var row = x[i] ?? throw new ArgumentException($"{name}[{i}] is null.", name);
            if (row.Length != d) throw new ArgumentException($"{name}[{i}] has {row.Length} columns but {name}[0] has {d}.", name);
            for (int j = 0; j < d; j++)
                if (!double.IsFinite(row[j]))
                    throw new ArgumentException($"{name}[{i}][{j}] = {Show(row[j])} is not a finite number.", name);
        }
    }

    public static string Show(double v) => v.ToString("G6", CultureInfo.InvariantCulture);

    /// <summary>Index of the largest entry; ties go to the lowest class index so results do not depend on order of evaluation.</summary>
    public static int ArgMax(double[] row)
    {
        int best = 0;
        for (int k = 1; k < row.Length; k++)
            if (row[k] > row[best]) best = k;
        return best;
    }
}
