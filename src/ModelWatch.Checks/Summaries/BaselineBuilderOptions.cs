using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Checks.Summaries;

/// <summary>Options of <see cref="BaselineBuilder"/>.</summary>
public sealed class BaselineBuilderOptions
{
    /// <summary>Largest reservoir the builder may keep.</summary>
    public const int MaximumReservoirSize = 5_000;

    /// <summary>Seed of the reservoir sample, so a baseline is reproducible. Default 20240601.</summary>
    public int Seed { get; init; } = 20240601;

    /// <summary>
    /// Reference rows kept in the seeded reservoir (residual sample, feature samples, bins, leverages).
    /// Default 5,000, the most allowed (enough for the distribution tests; the stored document stays under ~1 MB).
    /// </summary>
    [Range(20, MaximumReservoirSize)]
    public int ReservoirSize { get; init; } = MaximumReservoirSize;

    /// <summary>Quantile bins per feature for the population stability index. Default 10 (deciles, common practice).</summary>
    [Range(2, 100)]
    public int Bins { get; init; } = 10;

    /// <summary>Quantile of reference leverages that sets the extrapolation threshold. Default 0.99 (common practice).</summary>
    [Range(0.5, 0.9999)]
    public double LeverageQuantile { get; init; } = 0.99;
}
