using MathNet.Numerics;
using MathNet.Numerics.Distributions;

namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Normal and chi-square tails and quantiles. Upper tails come from the complementary functions directly
/// (erfc, the upper regularised gamma), so p-values far below 1e-16 keep their digits.
/// </summary>
public static class StandardDistributions
{
    /// <summary><c>P(Z ≥ z)</c> for a standard normal Z.</summary>
    public static double NormalUpperTail(double z) =>
        double.IsNaN(z) ? double.NaN : 0.5 * SpecialFunctions.Erfc(z / Math.Sqrt(2.0));

    /// <summary>Two-sided p-value <c>P(|Z| ≥ |z|)</c>.</summary>
    public static double NormalTwoSided(double z) =>
        double.IsNaN(z) ? double.NaN : SpecialFunctions.Erfc(Math.Abs(z) / Math.Sqrt(2.0));

    /// <summary>Standard normal quantile: the z with <c>P(Z ≤ z) = probability</c>.</summary>
    public static double NormalQuantile(double probability)
    {
        if (!(probability > 0.0 && probability < 1.0))
        {
            return probability == 0.0 ? double.NegativeInfinity : probability == 1.0 ? double.PositiveInfinity : double.NaN;
        }

        // Symmetry keeps the digits of tiny upper-tail probabilities.
        return probability > 0.5
            ? Math.Sqrt(2.0) * SpecialFunctions.ErfcInv(2.0 * (1.0 - probability))
            : -Math.Sqrt(2.0) * SpecialFunctions.ErfcInv(2.0 * probability);
    }

    /// <summary>Standard normal quantile of an upper-tail probability: the z with <c>P(Z ≥ z) = upperTail</c>.</summary>
    public static double NormalUpperQuantile(double upperTail) =>
        !(upperTail > 0.0 && upperTail < 1.0) ? NormalQuantile(1.0 - upperTail) : Math.Sqrt(2.0) * SpecialFunctions.ErfcInv(2.0 * upperTail);

    /// <summary><c>P(χ²_df ≥ x)</c>.</summary>
    public static double ChiSquareUpperTail(double x, double degreesOfFreedom)
    {
        if (double.IsNaN(x) || !(degreesOfFreedom > 0))
        {
            return double.NaN;
        }

        return x <= 0.0 ? 1.0 : double.IsPositiveInfinity(x) ? 0.0 : SpecialFunctions.GammaUpperRegularized(degreesOfFreedom / 2.0, x / 2.0);
    }

    /// <summary>The x with <c>P(χ²_df ≥ x) = upperTail</c>.</summary>
    public static double ChiSquareUpperQuantile(double upperTail, double degreesOfFreedom)
    {
        ArgumentOutOfRangeException.ThrowIfLessThanOrEqual(degreesOfFreedom, 0.0);
        if (!(upperTail > 0.0 && upperTail < 1.0))
        {
            throw new ArgumentOutOfRangeException(nameof(upperTail), upperTail, "An upper-tail probability must lie strictly between 0 and 1.");
        }

        // Inverting the upper tail itself (not 1 − tail) keeps accuracy for the budgeted α of 1e-5 and below.
        double a = degreesOfFreedom / 2.0;
        double x = 2.0 * SpecialFunctions.GammaLowerRegularizedInv(a, 1.0 - upperTail);

        // Newton steps on the upper tail itself recover the digits 1 − tail loses when the tail is tiny.
        for (int i = 0; i < 4; i++)
        {
            double q = ChiSquareUpperTail(x, degreesOfFreedom);
            double logDensity = ((a - 1.0) * Math.Log(x / 2.0)) - (x / 2.0) - SpecialFunctions.GammaLn(a) - Math.Log(2.0);
            double step = (q - upperTail) / Math.Exp(logDensity);
            if (!double.IsFinite(step))
            {
                break;
            }

            x = Math.Max(x + step, x / 2.0);
        }

        return x;
    }

    /// <summary>Two-sided p-value of Student's t (delegates to the incomplete beta function).</summary>
    public static double StudentTTwoSided(double t, double degreesOfFreedom) =>
        Distributions.TailProbability.StudentTTwoSided(t, degreesOfFreedom);

    /// <summary>Lower-tail probability <c>P(T ≤ t)</c> of Student's t.</summary>
    public static double StudentTLower(double t, double degreesOfFreedom)
    {
        double two = StudentTTwoSided(t, degreesOfFreedom);
        return t < 0 ? two / 2.0 : 1.0 - (two / 2.0);
    }

    /// <summary>Upper-tail p-value of the F distribution.</summary>
    public static double FisherUpper(double f, double numeratorDf, double denominatorDf) =>
        Distributions.TailProbability.FisherUpper(f, numeratorDf, denominatorDf);

    /// <summary>
    /// The f with <c>P(F(d1, d2) ≥ f) = upperTail</c>: bisection on the incomplete beta function's argument, which the
    /// upper tail is monotone in, so budgeted levels far below 1e-5 keep their digits.
    /// </summary>
    public static double FisherUpperQuantile(double upperTail, double numeratorDf, double denominatorDf)
    {
        if (!(upperTail > 0.0 && upperTail < 1.0) || !(numeratorDf > 0) || !(denominatorDf > 0))
        {
            return double.NaN;
        }

        // P(F ≥ f) = I_x(d2/2, d1/2) with x = d2/(d2 + d1·f), increasing in x.
        double low = 0.0;
        double high = 1.0;
        // Twelve significant digits of x are more than a printed critical value needs, and about 50 steps.
        for (int i = 0; i < 200 && high - low > 1e-12 * high; i++)
        {
            double mid = 0.5 * (low + high);
            if (SpecialFunctions.BetaRegularized(denominatorDf / 2.0, numeratorDf / 2.0, mid) < upperTail)
            {
                low = mid;
            }
            else
            {
                high = mid;
            }
        }

        double x = 0.5 * (low + high);
        return denominatorDf * (1.0 - x) / (numeratorDf * x);
    }

    /// <summary>The t with <c>P(|T_df| ≥ t) = twoSided</c>, from the F(1, df) quantile (T² ~ F(1, df)).</summary>
    public static double StudentTTwoSidedQuantile(double twoSided, double degreesOfFreedom) =>
        Math.Sqrt(FisherUpperQuantile(twoSided, 1.0, degreesOfFreedom));

    /// <summary>
    /// Converts a Student t statistic to the standard normal score with the same lower-tail probability,
    /// so per-run statistics on different degrees of freedom can feed one CUSUM.
    /// </summary>
    public static double StudentTToNormalScore(double t, double degreesOfFreedom)
    {
        if (double.IsNaN(t))
        {
            return double.NaN;
        }

        double tail = StudentTTwoSided(t, degreesOfFreedom) / 2.0;
        double z = NormalUpperQuantile(Math.Max(tail, 1e-300));
        return t >= 0 ? z : -z;
    }

    /// <summary>
    /// The standard normal score with the given upper-tail probability, the tail kept off 0 and 1 so a p-value that
    /// underflows or rounds to one still gives a finite score for a CUSUM.
    /// </summary>
    public static double UpperTailToNormalScore(double upperTail) => NormalUpperQuantile(Math.Clamp(upperTail, 1e-300, 1.0 - 1e-16));

    /// <summary>Normal cumulative distribution function.</summary>
    public static double NormalCdf(double z) => Normal.CDF(0.0, 1.0, z);
}
