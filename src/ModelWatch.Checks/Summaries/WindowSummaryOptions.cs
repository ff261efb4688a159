using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Checks.Summaries;

/// <summary>Options of <see cref="WindowSummaryBuilder"/>.</summary>
public sealed class WindowSummaryOptions
{
    /// <summary>Seed of the window's reservoir sample. Default 1.</summary>
    public int Seed { get; init; } = 1;

    /// <summary>Window rows kept for the distribution, spread and heteroscedasticity tests. Default 5,000.</summary>
    [Range(20, 100_000)]
    public int ReservoirSize { get; init; } = 5_000;

    /// <summary>Largest autocorrelation lag tracked for Ljung–Box. Default 10 (common practice).</summary>
    [Range(1, 50)]
    public int MaximumLag { get; init; } = 10;

    /// <summary>
    /// A served prediction differs from the recomputed one when <c>|served − recomputed| &gt; tolerance·max(1, |recomputed|)</c>.
    /// Default 1e-6 (common practice: well above float rounding in a serving path, far below any coefficient change).
    /// </summary>
    [Range(0.0, 1.0)]
    public double ServedTolerance { get; init; } = 1e-6;
}
