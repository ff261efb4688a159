namespace ModelWatch.Numerics.Statistics;

/// <summary>The outcome of a significance test: its statistic, p-value and reference distribution's degrees of freedom.</summary>
/// <param name="Statistic">The test statistic.</param>
/// <param name="PValue">The p-value (NaN when it cannot be computed).</param>
/// <param name="DegreesOfFreedom1">First (or only) degrees of freedom, NaN when the reference distribution has none.</param>
/// <param name="DegreesOfFreedom2">Second degrees of freedom (F tests), NaN otherwise.</param>
public sealed record StatisticalTest(double Statistic, double PValue, double DegreesOfFreedom1 = double.NaN, double DegreesOfFreedom2 = double.NaN);
