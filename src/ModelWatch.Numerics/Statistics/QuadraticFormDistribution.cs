namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Distribution of a quadratic form <c>Q = Σ λ_i z_i²</c> in independent standard normals, by Imhof's (1961)
/// inversion formula <c>P(Q &gt; 0) = ½ + (1/π) ∫₀^∞ sin θ(u) / (u ρ(u)) du</c>, integrated on a logarithmic grid.
/// </summary>
public static class QuadraticFormDistribution
{
    /// <summary><c>P(Σ λ_i z_i² &gt; 0)</c>.</summary>
    public static double UpperTailAtZero(IReadOnlyList<double> weights)
    {
        ArgumentNullException.ThrowIfNull(weights);
        if (weights.Count == 0)
        {
            return 0.0;
        }

        // u = e^s turns the integrand into sin θ(u)/ρ(u) ds, smooth and decaying at both ends; below u₀ it is
        // about u·Σλ/2, so starting there leaves out less than 1e-8.
        const double step = 0.02;
        double scale = weights.Sum(Math.Abs);
        double total = 0.0;
        for (double s = Math.Log(1e-8 / scale); s < 60.0; s += step)
        {
            double u = Math.Exp(s);
            double theta = 0.0;
            double logRho = 0.0;
            foreach (double l in weights)
            {
                theta += Math.Atan(l * u);
                logRho += Math.Log(1.0 + (l * l * u * u));
            }

            double value = Math.Sin(0.5 * theta) * Math.Exp(-0.25 * logRho);
            total += value * step;
            if (logRho > 100.0)
            {
                break;
            }
        }

        return Math.Clamp(0.5 + (total / Math.PI), 0.0, 1.0);
    }
}
