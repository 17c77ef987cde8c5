namespace Kit.Diagnostics;

/// <summary>How confidence bins are cut for reliability and ECE.</summary>
public enum BinningScheme
{
    /// <summary>Bins ((m−1)/M, m/M] of equal width on [0, 1], as in Guo et al. (2017).</summary>
    EqualWidth,
    /// <summary>Bins holding (as near as possible) the same number of examples, in order of confidence
    /// (Nixon et al. 2019, "Measuring Calibration in Deep Learning", adaptive binning).</summary>
    EqualMass,
}
