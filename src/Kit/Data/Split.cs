namespace Kit.Data;

/// <summary>
/// Row indices of each part, ascending. For a k-fold split, Test is the held-out fold and Validation is carved
/// from the remaining folds when a validation fraction is asked for (empty otherwise).
/// </summary>
public sealed record Split(int[] Train, int[] Validation, int[] Test, SplitSummary Summary)
{
    public const int TrainPart = 0, ValidationPart = 1, TestPart = 2, NoPart = -1;
    public static readonly IReadOnlyList<string> PartNames = ["train", "validation", "test"];

    /// <summary>The part of every row of a table of <paramref name="rows"/> rows (<see cref="NoPart"/> if in none).</summary>
    public int[] PartOf(int rows)
    {
        var part = new int[rows];
        Array.Fill(part, NoPart);
        foreach (int r in Train) part[r] = TrainPart;
        foreach (int r in Validation) part[r] = ValidationPart;
        foreach (int r in Test) part[r] = TestPart;
        return part;
    }

    public int[] Rows(int part) => part switch
    {
        TrainPart => Train,
        ValidationPart => Validation,
        TestPart => Test,
        _ => throw new ArgumentOutOfRangeException(nameof(part)),
    };
}
