namespace ModelWatch.Numerics.Statistics;

/// <summary>A k-sample Anderson–Darling statistic.</summary>
/// <param name="Statistic">A² (version 1 or the midrank version 2).</param>
/// <param name="StandardDeviation">σ_N, the null standard deviation of A².</param>
/// <param name="Standardized">T = (A² − (k − 1)) / σ_N.</param>
/// <param name="SampleCount">k.</param>
/// <param name="TotalCount">N, the pooled sample size.</param>
public sealed record AndersonDarlingResult(double Statistic, double StandardDeviation, double Standardized, int SampleCount, int TotalCount);
