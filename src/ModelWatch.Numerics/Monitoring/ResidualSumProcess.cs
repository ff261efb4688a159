namespace ModelWatch.Numerics.Monitoring;

/// <summary>
/// The OLS-residual monitoring processes (Chu, Stinchcombe &amp; White 1996; Chu, Hornik &amp; Kuan 1995): sums of the
/// errors <c>e_i = y_i − x_iᵀb_hist</c> of the history's coefficients, scaled by <c>σ̂√n</c>. Over a moving window
/// of K rows the sum is the OLS-MOSUM process; from the start of monitoring (plus the history's own residual sum,
/// zero with an intercept) it is the OLS-CUSUM process.
/// </summary>
public static class ResidualSumProcess
{
    /// <summary>The process value of an error sum: <c>Σe/(σ̂√n)</c>.</summary>
    public static double Value(double errorSum, double sigma, double historyRows)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(sigma);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(historyRows);
        return errorSum / (sigma * Math.Sqrt(historyRows));
    }
}
