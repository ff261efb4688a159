using ModelWatch.Checks.Sequential;

namespace ModelWatch.Checks.Features;

/// <summary>
/// The features check's memory: what every row consumed so far looks like (reference rows included), the rows
/// waiting until a block is large enough for its statistic, and the CUSUMs.
/// </summary>
public sealed record FeaturesState
{
    /// <summary>Rows behind <see cref="Means"/> (reference plus consumed).</summary>
    public long MeanRows { get; init; }

    /// <summary>Mean of each feature over those rows; empty before the first run.</summary>
    public double[] Means { get; init; } = [];

    /// <summary>Rows per baseline bin, per feature, of the reference sample plus every consumed row.</summary>
    public long[][] BinCounts { get; init; } = [];

    /// <summary>Reference-sample and consumed rows above the leverage threshold.</summary>
    public long LeverageExceedances { get; init; }

    /// <summary>Reference-sample and consumed rows behind <see cref="LeverageExceedances"/>.</summary>
    public long LeverageRows { get; init; }

    /// <summary>New rows waiting for the bin-share CUSUMs (too few for a chi-square yet), per feature and bin.</summary>
    public long[][] PendingBinCounts { get; init; } = [];

    /// <summary>New rows waiting for the leverage CUSUM.</summary>
    public long PendingLeverageRows { get; init; }

    /// <summary>Of those, rows above the leverage threshold.</summary>
    public long PendingLeverageExceedances { get; init; }

    /// <summary>Location CUSUM per feature.</summary>
    public Dictionary<string, CusumSums> Location { get; init; } = [];

    /// <summary>Bin-share (shape) CUSUM per feature.</summary>
    public Dictionary<string, CusumSums> Shape { get; init; } = [];

    /// <summary>Leverage-exceedance CUSUM.</summary>
    public CusumSums Leverage { get; init; } = new();

    /// <summary>True from a location alarm until every location sum is back at zero (rows stay out of the running means).</summary>
    public bool LocationQuarantined { get; init; }

    /// <summary>True from a shape alarm until every shape sum is back at zero (rows stay out of the running counts).</summary>
    public bool ShapeQuarantined { get; init; }

    /// <summary>True from a leverage alarm until its sum is back at zero (rows stay out of the running counts).</summary>
    public bool LeverageQuarantined { get; init; }
}
