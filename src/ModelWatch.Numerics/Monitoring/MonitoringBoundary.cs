using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Numerics.Monitoring;

/// <summary>
/// The boundaries of the structural-change monitors, in monitoring time <c>x = k/n</c> (observations so far over the
/// history's n; monitoring starts after x = 1):
/// <list type="bullet">
/// <item>moving-window processes (moving estimates, OLS-MOSUM; Chu, Hornik &amp; Kuan 1995; Leisch, Hornik &amp; Kuan
/// 2000, Econometric Theory 16:835–854): <c>c·√(2·log₊ x)</c>, with <c>log₊ x = max(1, log x)</c>;</item>
/// <item>the OLS-CUSUM monitor (Chu, Stinchcombe &amp; White 1996, Econometrica 64:1045–1065):
/// <c>√(x(x − 1)(c² + log(x/(x − 1))))</c>, whose crossing probability over an unbounded horizon is
/// <c>2[1 − Φ(c) + c·φ(c)]</c> (Robbins &amp; Siegmund 1970).</item>
/// </list>
/// These are the boundaries R's strucchange uses (Zeileis, Leisch, Kleiber &amp; Hornik 2005, J. Applied
/// Econometrics 20:99–121); the tests compare them value for value.
/// </summary>
public static class MonitoringBoundary
{
    /// <summary><c>max(1, log x)</c>: the boundary stays flat for the first e history lengths.</summary>
    public static double LogPlus(double x) => x <= Math.E ? 1.0 : Math.Log(x);

    /// <summary>The moving-window boundary <c>c·√(2·log₊ x)</c>.</summary>
    public static double MovingWindow(double criticalValue, double x) => criticalValue * Math.Sqrt(2.0 * LogPlus(x));

    /// <summary>The OLS-CUSUM boundary <c>√(x(x − 1)(c² + log(x/(x − 1))))</c>, for x &gt; 1.</summary>
    public static double Cusum(double criticalValue, double x)
    {
        ArgumentOutOfRangeException.ThrowIfLessThanOrEqual(x, 1.0);
        return Math.Sqrt(x * (x - 1.0) * ((criticalValue * criticalValue) + Math.Log(x / (x - 1.0))));
    }

    /// <summary>Probability that the OLS-CUSUM process ever crosses its boundary with critical value c: <c>2[1 − Φ(c) + c·φ(c)]</c>.</summary>
    public static double CusumCrossingProbability(double criticalValue) =>
        2.0 * (StandardDistributions.NormalUpperTail(criticalValue) + (criticalValue * Math.Exp(-0.5 * criticalValue * criticalValue) / Math.Sqrt(2.0 * Math.PI)));

    /// <summary>The OLS-CUSUM critical value whose crossing probability is <paramref name="alpha"/> (bisection to full precision).</summary>
    public static double CusumCriticalValue(double alpha)
    {
        if (!(alpha > 0.0 && alpha < 1.0))
        {
            throw new ArgumentOutOfRangeException(nameof(alpha), alpha, "The size must lie strictly between 0 and 1.");
        }

        // The crossing probability falls from 2 at c = 0 towards 0, monotonically.
        double lo = 0.0;
        double hi = 1.0;
        while (CusumCrossingProbability(hi) > alpha)
        {
            lo = hi;
            hi *= 2.0;
        }

        for (int i = 0; i < 200 && hi - lo > 1e-15 * hi; i++)
        {
            double mid = 0.5 * (lo + hi);
            if (CusumCrossingProbability(mid) > alpha)
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
