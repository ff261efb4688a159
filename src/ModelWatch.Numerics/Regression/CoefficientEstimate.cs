namespace ModelWatch.Numerics.Regression;

/// <summary>
/// One coefficient of a fit. An aliased term (dropped for an exact linear dependency) has no estimate:
/// <see cref="Estimate"/> and the rest are null rather than NaN.
/// </summary>
/// <param name="Term">The term name: <see cref="DesignLayout.InterceptTerm"/> or a feature column.</param>
/// <param name="Estimate">The least-squares estimate, or null when aliased.</param>
/// <param name="StandardError">Its standard error; null when aliased or when no residual degrees of freedom remain.</param>
/// <param name="TStatistic">Estimate over standard error (may be infinite for an exact fit).</param>
/// <param name="PValue">Two-sided p-value of the t statistic on the residual degrees of freedom.</param>
public sealed record CoefficientEstimate(string Term, double? Estimate, double? StandardError, double? TStatistic, double? PValue)
{
    /// <summary>True when the term was dropped because it is an exact linear combination of earlier terms.</summary>
    public bool IsAliased => Estimate is null;
}
