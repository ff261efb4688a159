namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Everything ModelWatch reads off a least-squares fit, computed from the augmented factor alone.
/// Quantities that do not exist for a given fit (an exact fit's t, a rank-deficient term's estimate,
/// R² of a constant outcome) are NaN here and null in JSON; coefficients are never NaN.
/// </summary>
public sealed class FitSummary
{
    /// <summary>The design.</summary>
    public required DesignLayout Layout { get; init; }

    /// <summary>The factor the summary was read from (kept so checks can merge or test against it).</summary>
    public required AugmentedFactor Factor { get; init; }

    /// <summary>Rows fitted.</summary>
    public long RowCount => Factor.RowCount;

    /// <summary>Parameters of the design, the intercept included.</summary>
    public int ParameterCount => Layout.ParameterCount;

    /// <summary>Numerical rank of the design.</summary>
    public required int Rank { get; init; }

    /// <summary>
    /// Relative tolerance of the rank decision: a singular value of the column-equilibrated design at or
    /// below <c>RankTolerance × σ_max</c> counts as zero (<c>max(n, p) · ε</c>).
    /// </summary>
    public required double RankTolerance { get; init; }

    /// <summary>Why rank was lost, or null for a full-rank design.</summary>
    public RankDeficiency? RankDeficiency { get; init; }

    /// <summary>Coefficients in design order, aliased terms included with null estimates.</summary>
    public required IReadOnlyList<CoefficientEstimate> Coefficients { get; init; }

    /// <summary>
    /// Coefficient covariance <c>s²(RᵀR)⁻¹</c>, p×p in design order. Rows and columns of aliased terms are NaN.
    /// </summary>
    public required double[,] Covariance { get; init; }

    /// <summary>Residual sum of squares.</summary>
    public required double ResidualSumOfSquares { get; init; }

    /// <summary>Residual degrees of freedom, <c>n − rank</c>.</summary>
    public required long ResidualDegreesOfFreedom { get; init; }

    /// <summary>Residual standard deviation <c>√(RSS/(n − rank))</c>; NaN with no residual degrees of freedom.</summary>
    public required double ResidualStandardDeviation { get; init; }

    /// <summary>Total sum of squares: centred with an intercept, uncentred without (NIST's definitions).</summary>
    public required double TotalSumOfSquares { get; init; }

    /// <summary>R², centred with an intercept and uncentred without.</summary>
    public required double RSquared { get; init; }

    /// <summary>Adjusted R².</summary>
    public required double AdjustedRSquared { get; init; }

    /// <summary>Overall F statistic of the model against the intercept-only (or empty) model.</summary>
    public required double FStatistic { get; init; }

    /// <summary>Upper-tail p-value of <see cref="FStatistic"/>.</summary>
    public required double FPValue { get; init; }

    /// <summary>
    /// Condition number of the design with every column scaled to unit length (intercept included, not centred):
    /// the Belsley–Kuh–Welsch scaled condition number. +∞ when a column is exactly dependent.
    /// </summary>
    public required double ConditionNumber { get; init; }

    /// <summary>Singular values of the column-equilibrated design, largest first.</summary>
    public required IReadOnlyList<double> SingularValues { get; init; }

    /// <summary>
    /// Variance inflation factors by feature (only with an intercept; empty without). An aliased feature's VIF is +∞.
    /// </summary>
    public required IReadOnlyDictionary<string, double> VarianceInflationFactors { get; init; }

    /// <summary>Plain-language cautions, such as severe ill-conditioning.</summary>
    public required IReadOnlyList<string> Warnings { get; init; }

    /// <summary>True when every parameter could be estimated.</summary>
    public bool IsFullRank => Rank == ParameterCount;
}
