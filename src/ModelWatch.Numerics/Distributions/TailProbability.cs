using MathNet.Numerics;

namespace ModelWatch.Numerics.Distributions;

/// <summary>
/// Upper-tail probabilities computed from the regularised incomplete beta function directly, so that
/// small p-values keep their digits (1 − CDF would round them to zero).
/// </summary>
public static class TailProbability
{
    /// <summary>Two-sided p-value of Student's t with <paramref name="degreesOfFreedom"/>: <c>P(|T| ≥ |t|)</c>.</summary>
    public static double StudentTTwoSided(double t, double degreesOfFreedom)
    {
        if (double.IsNaN(t) || !(degreesOfFreedom > 0))
        {
            return double.NaN;
        }

        if (double.IsInfinity(t))
        {
            return 0.0;
        }

        double x = degreesOfFreedom / (degreesOfFreedom + (t * t));
        return SpecialFunctions.BetaRegularized(degreesOfFreedom / 2.0, 0.5, x);
    }

    /// <summary>Upper-tail p-value of the F distribution: <c>P(F(d1, d2) ≥ f)</c>.</summary>
    public static double FisherUpper(double f, double numeratorDf, double denominatorDf)
    {
        if (double.IsNaN(f) || !(numeratorDf > 0) || !(denominatorDf > 0))
        {
            return double.NaN;
        }

        if (f <= 0.0)
        {
            return 1.0;
        }

        if (double.IsPositiveInfinity(f))
        {
            return 0.0;
        }

        double x = denominatorDf / (denominatorDf + (numeratorDf * f));
        return SpecialFunctions.BetaRegularized(denominatorDf / 2.0, numeratorDf / 2.0, x);
    }
}
