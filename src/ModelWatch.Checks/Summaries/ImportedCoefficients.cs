namespace ModelWatch.Checks.Summaries;

/// <summary>
/// Deployed coefficients as a training pipeline exported them. Only <see cref="Coefficients"/> is required;
/// whatever else is missing makes the tests that need it report <c>skipped</c>, never a guess.
/// </summary>
public sealed class ImportedCoefficients
{
    /// <summary>Coefficients by term (<c>(intercept)</c> and every feature of the layout).</summary>
    public required IReadOnlyDictionary<string, double> Coefficients { get; init; }

    /// <summary>Coefficient covariance, p×p in the layout's term order, if the pipeline exported it.</summary>
    public double[][]? Covariance { get; init; }

    /// <summary>Standard errors by term, if exported without the covariance (enough for per-coefficient z, not for Wald).</summary>
    public IReadOnlyDictionary<string, double>? StandardErrors { get; init; }

    /// <summary>Training rows, if known.</summary>
    public long? RowCount { get; init; }

    /// <summary>Training residual standard deviation, if known.</summary>
    public double? ResidualStandardDeviation { get; init; }

    /// <summary>Training residual degrees of freedom, if known.</summary>
    public long? ResidualDegreesOfFreedom { get; init; }
}
