namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// The Durbin–Watson (1950, 1951) bounds for a regression with an intercept and k' slopes on n rows. The exact
/// null distribution of d depends on the design; it lies between the distributions of
/// <c>d_L = Σ ν_i z_i² / Σ z_i²</c> (i = 1..n−p) and <c>d_U = Σ ν_{i+k'} z_i² / Σ z_i²</c>, with
/// <c>ν_j = 4 sin²(πj/(2n))</c> the eigenvalues of the first-difference matrix. Critical values by Imhof's formula.
/// </summary>
public static class DurbinWatsonBounds
{
    /// <summary>Lower and upper one-sided critical values at level α (test of positive autocorrelation).</summary>
    public static (double Lower, double Upper) CriticalValues(int rows, int slopes, double alpha)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(slopes, 0);
        int residualDf = rows - slopes - 1;
        ArgumentOutOfRangeException.ThrowIfLessThan(residualDf, 2, nameof(rows));
        double[] lower = Enumerable.Range(1, residualDf).Select(i => Eigenvalue(i, rows)).ToArray();
        double[] upper = Enumerable.Range(1, residualDf).Select(i => Eigenvalue(i + slopes, rows)).ToArray();
        return (Quantile(lower, alpha), Quantile(upper, alpha));
    }

    /// <summary>
    /// Bounds on the exact p-value <c>P(d ≤ d_obs)</c> of a test for positive autocorrelation: the conservative one from
    /// <c>d_L</c> and the liberal one from <c>d_U</c>; the design's exact p-value lies between them.
    /// </summary>
    public static (double Conservative, double Liberal) PositiveAutocorrelationPValue(int rows, int slopes, double d)
    {
        int residualDf = rows - slopes - 1;
        ArgumentOutOfRangeException.ThrowIfLessThan(residualDf, 2, nameof(rows));
        double[] lower = Enumerable.Range(1, residualDf).Select(i => Eigenvalue(i, rows)).ToArray();
        double[] upper = Enumerable.Range(1, residualDf).Select(i => Eigenvalue(i + slopes, rows)).ToArray();
        return (LowerTail(lower, d), LowerTail(upper, d));
    }

    /// <summary><c>P(d_bound ≤ d)</c> for the given eigenvalues.</summary>
    public static double LowerTail(IReadOnlyList<double> eigenvalues, double d)
    {
        ArgumentNullException.ThrowIfNull(eigenvalues);
        return 1.0 - QuadraticFormDistribution.UpperTailAtZero(eigenvalues.Select(v => v - d).ToArray());
    }

    private static double Eigenvalue(int j, int n)
    {
        double s = Math.Sin(Math.PI * j / (2.0 * n));
        return 4.0 * s * s;
    }

    private static double Quantile(double[] eigenvalues, double alpha)
    {
        double lo = 0.0;
        double hi = 4.0;
        for (int i = 0; i < 22; i++)
        {
            double mid = 0.5 * (lo + hi);
            if (LowerTail(eigenvalues, mid) < alpha)
            {
                lo = mid;
            }
            else
            {
                hi = mid;
            }
        }

        return 0.5 * (lo + hi);
    }
}
