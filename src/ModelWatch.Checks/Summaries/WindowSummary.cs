using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Summaries;

/// <summary>
/// One window's rows, summarised against a baseline in a single pass: the refit, the deployed coefficients'
/// errors, bin counts, leverages, served-prediction agreement, a reservoir sample for distribution tests, and
/// the factor of the rows new since the previous run (for the sequential statistics).
/// </summary>
public sealed class WindowSummary
{
    /// <summary>Rows offered.</summary>
    public required long RowsRead { get; init; }

    /// <summary>Rows accepted into the fit.</summary>
    public required long RowsAccepted { get; init; }

    /// <summary>Rows rejected for a non-finite value.</summary>
    public required long RowsRejected { get; init; }

    /// <summary>Non-finite values by column (a rejected row may count in several columns).</summary>
    public required IReadOnlyDictionary<string, long> NonFiniteByColumn { get; init; }

    /// <summary>Features that took a single value in every accepted row.</summary>
    public required IReadOnlyList<string> ConstantFeatures { get; init; }

    /// <summary>Per-column summaries (features, then the outcome).</summary>
    public required IReadOnlyList<ColumnSummary> Columns { get; init; }

    /// <summary>The factor of the accepted rows; null when there were none.</summary>
    public AugmentedFactor? Factor { get; init; }

    /// <summary>The refit; null when there were no more rows than parameters.</summary>
    public FitSummary? Fit { get; init; }

    /// <summary>Feature means of the accepted rows.</summary>
    public required double[] FeatureMeans { get; init; }

    /// <summary>Σ e0 of the deployed coefficients' errors <c>e0 = y − x·b0</c>.</summary>
    public required double DeployedErrorSum { get; init; }

    /// <summary>Σ e0².</summary>
    public required double DeployedErrorSumOfSquares { get; init; }

    /// <summary>Σ |e0|.</summary>
    public required double DeployedAbsoluteErrorSum { get; init; }

    /// <summary>Σ (y − ȳ_ref)², the benchmark of the out-of-sample R²; NaN when the baseline has no outcome mean.</summary>
    public required double OutcomeDeviationSumOfSquares { get; init; }

    /// <summary>Mean-centred autocorrelations r_1..r_h of e0 in row order (empty with too few rows).</summary>
    public required double[] Autocorrelations { get; init; }

    /// <summary>Durbin–Watson d of the mean-centred e0 in row order (NaN with fewer than 2 rows).</summary>
    public required double DurbinWatson { get; init; }

    /// <summary>Rows per baseline bin, per feature (empty when the baseline has no bins).</summary>
    public required IReadOnlyList<long[]> FeatureBinCounts { get; init; }

    /// <summary>Rows per baseline bin, per feature, of the rows new since the previous run.</summary>
    public IReadOnlyList<long[]> NewRowsFeatureBinCounts { get; init; } = [];

    /// <summary>Rows new since the previous run whose leverage exceeds the baseline's threshold.</summary>
    public long NewRowsLeverageExceedanceCount { get; init; }

    /// <summary>Whether leverages against the baseline factor were computed.</summary>
    public required bool LeverageComputed { get; init; }

    /// <summary>Rows whose leverage exceeds the baseline's threshold.</summary>
    public required long LeverageExceedanceCount { get; init; }

    /// <summary>Rows whose leverage exceeds the largest reference leverage.</summary>
    public required long LeverageAboveReferenceMaximumCount { get; init; }

    /// <summary>Largest leverage in the window (NaN when not computed).</summary>
    public required double MaximumLeverage { get; init; }

    /// <summary>Rows of the reservoir sample.</summary>
    public required int SampleSize { get; init; }

    /// <summary>Standardized deployed errors <c>e0/(s_ref √(1 + h0))</c> of the sample rows, in row order.</summary>
    public required double[] ResidualSample { get; init; }

    /// <summary>Refit residuals of the sample rows (empty without a refit), in row order.</summary>
    public required double[] RefitResidualSample { get; init; }

    /// <summary>Sample values per feature, in row order.</summary>
    public required IReadOnlyList<double[]> FeatureSamples { get; init; }

    /// <summary>Rows that came with a served prediction.</summary>
    public required long ServedCount { get; init; }

    /// <summary>Rows whose served prediction differs from the deployed coefficients' beyond tolerance.</summary>
    public required long ServedMismatchCount { get; init; }

    /// <summary>Largest |served − recomputed|.</summary>
    public required double ServedMaximumDifference { get; init; }

    /// <summary>Mean of served − recomputed.</summary>
    public required double ServedMeanDifference { get; init; }

    /// <summary>Factor of the rows new since the previous run (sequential statistics); null when none.</summary>
    public AugmentedFactor? NewRows { get; init; }

    /// <summary>Mean deployed error e0 of the accepted rows.</summary>
    public double DeployedBias => RowsAccepted == 0 ? double.NaN : DeployedErrorSum / RowsAccepted;
}
