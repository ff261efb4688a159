using MathNet.Numerics;

namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Upper tail of the beta-binomial distribution. If a threshold is the value exceeded by <c>j</c> of <c>N</c>
/// exchangeable reference values, the number of <c>m</c> new values above it is BetaBinomial(m, j + 1, N − j)
/// under no change: this carries the reference sample's own uncertainty into the exceedance test.
/// </summary>
public static class BetaBinomial
{
    /// <summary>Mid-p upper tail <c>P(X &gt; x) + P(X = x)/2</c>, which keeps the size near nominal for small counts.</summary>
    public static double UpperTailMidP(long trials, double alpha, double beta, long observed)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(trials);
        if (observed <= 0)
        {
            return 1.0 - (0.5 * Probability(trials, alpha, beta, 0));
        }

        if (observed > trials)
        {
            return 0.0;
        }

        double below = 0.0;
        for (long x = 0; x < observed; x++)
        {
            below += Probability(trials, alpha, beta, x);
        }

        double tail = Math.Max(0.0, 1.0 - below);
        if (tail < 1e-6)
        {
            // Sum the upper terms directly when the complement would lose digits.
            tail = 0.0;
            for (long x = observed; x <= trials; x++)
            {
                double pr = Probability(trials, alpha, beta, x);
                tail += pr;
                if (pr < tail * 1e-17)
                {
                    break;
                }
            }
        }

        return tail - (0.5 * Probability(trials, alpha, beta, observed));
    }

    /// <summary><c>P(X = x)</c>.</summary>
    public static double Probability(long trials, double alpha, double beta, long x) =>
        Math.Exp(SpecialFunctions.BinomialLn((int)trials, (int)x)
                 + SpecialFunctions.BetaLn(x + alpha, trials - x + beta)
                 - SpecialFunctions.BetaLn(alpha, beta));
}
