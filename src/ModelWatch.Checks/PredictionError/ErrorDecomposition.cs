namespace ModelWatch.Checks.PredictionError;

/// <summary>
/// The exact split of the deployed coefficients' mean squared error on a window:
/// <c>MSE_dep = MSE_refit + bias² + δ_sᵀS_cδ_s</c> (noise, level drift, slope drift), with no cross terms.
/// </summary>
/// <param name="DeployedMse">Mean squared error of the deployed coefficients.</param>
/// <param name="RefitMse">Mean squared residual of the window's own refit (the noise).</param>
/// <param name="BiasSquared">Squared mean error (level drift).</param>
/// <param name="SlopeDrift">Drift of the slopes: <c>‖Rδ‖²/m − bias²</c>.</param>
public sealed record ErrorDecomposition(double DeployedMse, double RefitMse, double BiasSquared, double SlopeDrift)
{
    /// <summary>Everything attributable to coefficient drift: level plus slopes.</summary>
    public double Drift => BiasSquared + SlopeDrift;

    /// <summary>Shares of the increase over a reference MSE, or NaN when there is no increase.</summary>
    public (double Noise, double Level, double Slopes) SharesOfIncrease(double referenceMse)
    {
        double increase = DeployedMse - referenceMse;
        if (!(increase > 0))
        {
            return (double.NaN, double.NaN, double.NaN);
        }

        return ((RefitMse - referenceMse) / increase, BiasSquared / increase, SlopeDrift / increase);
    }
}
