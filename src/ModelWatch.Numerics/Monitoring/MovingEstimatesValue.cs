namespace ModelWatch.Numerics.Monitoring;

/// <summary>One evaluation of the moving-estimates process (see <see cref="MovingEstimates"/>), in term order.</summary>
/// <param name="Estimates">The window's least-squares coefficients b̂_w.</param>
/// <param name="Standardized">Coefficient-standardized components z_j (one per coefficient; they name the coefficient).</param>
/// <param name="SymmetricRoot">The components of strucchange's process M (rescaled by the window's own cross-products).</param>
public sealed record MovingEstimatesValue(double[] Estimates, double[] Standardized, double[] SymmetricRoot);
