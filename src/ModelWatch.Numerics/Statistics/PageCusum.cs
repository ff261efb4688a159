using MathNet.Numerics.LinearAlgebra;

namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Page's (1954) two-sided CUSUM on standardized per-run statistics z (N(0,1) when nothing changed):
/// <c>S⁺ = max(0, S⁺ + z − k)</c>, <c>S⁻ = max(0, S⁻ − z − k)</c>, alarm when either exceeds h. Average run
/// lengths by the Brook–Evans (1972) Markov chain, or Siegmund's (1985) approximation; thresholds by inverting
/// the Markov-chain ARL. Two-sided ARL combines the one-sided ones as <c>1/ARL = 1/ARL⁺ + 1/ARL⁻</c>.
/// </summary>
public static class PageCusum
{
    /// <summary>Reference value for a design shift of one standard deviation.</summary>
    public const double DefaultReference = 0.5;

    /// <summary>States of the Markov chain; 200 keeps the ARL within about 0.1 % of the continuous one.</summary>
    public const int DefaultStates = 200;

    /// <summary>Advances the two one-sided sums by one observation; returns whether either exceeds h.</summary>
    public static bool Step(ref double upper, ref double lower, double z, double reference, double threshold)
    {
        upper = Math.Max(0.0, upper + z - reference);
        lower = Math.Max(0.0, lower - z - reference);
        return upper > threshold || lower > threshold;
    }

    /// <summary>Advances the upper one-sided sum alone (shifts that only go one way: a chi-square, an exceedance count).</summary>
    public static bool StepUpper(ref double upper, double z, double reference, double threshold)
    {
        upper = Math.Max(0.0, upper + z - reference);
        return upper > threshold;
    }

    /// <summary>
    /// One-sided ARL from a zero start for observations N(μ, 1), by the Brook–Evans Markov chain with
    /// <paramref name="states"/> states of width <c>w = 2h/(2t − 1)</c>.
    /// </summary>
    public static double OneSidedArlMarkov(double threshold, double reference, double shift, int states = DefaultStates)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(threshold);
        ArgumentOutOfRangeException.ThrowIfLessThan(states, 2);
        double w = 2.0 * threshold / ((2.0 * states) - 1.0);

        // A step from state i to state j depends on j − i only: Φ at the 2t − 1 cell edges (m + ½)w + k − μ,
        // m = −t..t−1, gives every transition probability, instead of t² evaluations.
        var edge = new double[2 * states];
        for (int m = -states; m < states; m++)
        {
            edge[m + states] = StandardDistributions.NormalCdf(((m + 0.5) * w) + reference - shift);
        }

        var a = Matrix<double>.Build.Dense(states, states);
        for (int i = 0; i < states; i++)
        {
            a[i, 0] = -edge[states - i];
            for (int j = 1; j < states; j++)
            {
                a[i, j] = -(edge[j - i + states] - edge[j - i - 1 + states]);
            }

            a[i, i] += 1.0;
        }

        var arl = a.Solve(Vector<double>.Build.Dense(states, 1.0));
        return arl[0];
    }

    /// <summary>Two-sided ARL for observations N(μ, 1) (symmetric k and h).</summary>
    public static double TwoSidedArlMarkov(double threshold, double reference, double shift, int states = DefaultStates)
    {
        double up = OneSidedArlMarkov(threshold, reference, shift, states);

        // In control the two sides are mirror images: one chain serves both.
        double down = shift == 0.0 ? up : OneSidedArlMarkov(threshold, reference, -shift, states);
        return 1.0 / ((1.0 / up) + (1.0 / down));
    }

    /// <summary>Siegmund's one-sided approximation <c>(e^{−2Δb} + 2Δb − 1)/(2Δ²)</c>, Δ = μ − k, b = h + 1.166.</summary>
    public static double OneSidedArlSiegmund(double threshold, double reference, double shift)
    {
        double delta = shift - reference;
        double b = threshold + 1.166;
        return Math.Abs(delta) < 1e-12 ? b * b : (Math.Exp(-2.0 * delta * b) + (2.0 * delta * b) - 1.0) / (2.0 * delta * delta);
    }

    /// <summary>
    /// The threshold h whose in-control ARL is <paramref name="targetArl"/>, two-sided or (<paramref name="oneSided"/>)
    /// for the upper sum alone (bisection on the Markov chain).
    /// </summary>
    public static double ThresholdForArl(double targetArl, double reference = DefaultReference, bool oneSided = false, int states = DefaultStates)
    {
        ArgumentOutOfRangeException.ThrowIfLessThanOrEqual(targetArl, 1.0);
        double Arl(double h) => oneSided ? OneSidedArlMarkov(h, reference, 0.0, states) : TwoSidedArlMarkov(h, reference, 0.0, states);
        double lo = 0.01;
        double hi = 1.0;
        while (Arl(hi) < targetArl)
        {
            lo = hi;
            hi *= 2.0;
        }

        for (int iteration = 0; iteration < 60 && hi - lo > 1e-6; iteration++)
        {
            double mid = 0.5 * (lo + hi);
            if (Arl(mid) < targetArl)
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
