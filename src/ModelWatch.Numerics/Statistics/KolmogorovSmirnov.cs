namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Two-sample Kolmogorov–Smirnov test with one pinned p-value rule: the exact no-ties distribution
/// (Hodges 1958; the lattice-path recursion used by R's <c>psmirnov</c>) when <c>n·m ≤ </c><see cref="ExactLimit"/>,
/// otherwise the plain Kolmogorov limit <c>Q_KS(√(nm/(n+m))·D)</c> with no finite-sample correction.
/// </summary>
public static class KolmogorovSmirnov
{
    /// <summary>Largest <c>n·m</c> for which the exact distribution is used (at most a millisecond or so of work).</summary>
    public const long ExactLimit = 250_000;

    /// <summary>Tests whether two samples come from the same continuous distribution.</summary>
    public static KolmogorovSmirnovResult TwoSample(IReadOnlyList<double> first, IReadOnlyList<double> second)
    {
        ArgumentNullException.ThrowIfNull(first);
        ArgumentNullException.ThrowIfNull(second);
        if (first.Count == 0 || second.Count == 0)
        {
            throw new ArgumentException("The Kolmogorov–Smirnov test needs two non-empty samples.");
        }

        return TwoSampleSorted(SortedSample.Of(first), SortedSample.Of(second));
    }

    /// <summary>The same test on two samples already sorted ascending (a reference sample sorted once is reused).</summary>
    public static KolmogorovSmirnovResult TwoSampleSorted(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        if (a.IsEmpty || b.IsEmpty)
        {
            throw new ArgumentException("The Kolmogorov–Smirnov test needs two non-empty samples.");
        }

        double d = Statistic(a, b);
        int n = a.Length;
        int m = b.Length;
        bool exact = (long)n * m <= ExactLimit;
        double p = exact ? ExactUpperTail(n, m, d) : KolmogorovUpperTail(Math.Sqrt((double)n * m / (n + m)) * d);
        return new KolmogorovSmirnovResult(d, p, exact, n, m);
    }

    /// <summary>The statistic <c>sup |F_n − G_m|</c> of two sorted samples.</summary>
    public static double Statistic(ReadOnlySpan<double> sortedFirst, ReadOnlySpan<double> sortedSecond)
    {
        int n = sortedFirst.Length;
        int m = sortedSecond.Length;
        int i = 0;
        int j = 0;
        double d = 0.0;
        while (i < n && j < m)
        {
            double v = Math.Min(sortedFirst[i], sortedSecond[j]);
            while (i < n && sortedFirst[i] <= v)
            {
                i++;
            }

            while (j < m && sortedSecond[j] <= v)
            {
                j++;
            }

            d = Math.Max(d, Math.Abs(((double)i / n) - ((double)j / m)));
        }

        return d;
    }

    /// <summary>
    /// Exact <c>P(D ≥ d)</c> for samples of sizes n and m without ties: one minus the share of lattice paths
    /// that stay strictly inside the band <c>|i/n − j/m| &lt; d</c>, normalised step by step to avoid overflow.
    /// </summary>
    public static double ExactUpperTail(int n, int m, double d)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(m, 1);
        if (m > n)
        {
            (n, m) = (m, n);
        }

        double md = m;
        double nd = n;

        // The half-step below the attained value absorbs the rounding in D = |i/m − j/n|.
        double q = (0.5 + Math.Floor((d * md * nd) - 1e-7)) / (md * nd);
        var step = new double[n + 1];
        var u = new double[n + 1];
        for (int j = 0; j <= n; j++)
        {
            step[j] = j / nd;
            u[j] = step[j] > q ? 0.0 : 1.0;
        }

        // Only the cells inside the band |i/m − j/n| ≤ q can be reached, and the band is an interval of j that moves
        // right as i grows; visiting just that interval (and clearing what it leaves behind) does the same arithmetic
        // on the same cells as sweeping the whole row, in a fraction of the time when one sample is much larger.
        int low = 0;
        int high = n;
        for (int i = 1; i <= m; i++)
        {
            double a = i / md;
            double w = i / (double)(i + n);
            (int bandLow, int bandHigh) = Band(step, a, q);
            for (int j = low; j <= Math.Min(high, bandLow - 1); j++)
            {
                u[j] = 0.0;
            }

            for (int j = Math.Max(low, bandHigh + 1); j <= high; j++)
            {
                u[j] = 0.0;
            }

            for (int j = bandLow; j <= bandHigh; j++)
            {
                u[j] = j == 0 ? w * u[0] : (w * u[j]) + u[j - 1];
            }

            (low, high) = (Math.Min(bandLow, n), Math.Max(bandHigh, -1));
            if (bandLow > bandHigh)
            {
                return 1.0;
            }
        }

        return Math.Clamp(1.0 - u[n], 0.0, 1.0);
    }

    /// <summary>The interval of j with <c>|a − step[j]| ≤ q</c> (empty when the first exceeds the second).</summary>
    private static (int Low, int High) Band(double[] step, double a, double q)
    {
        int n = step.Length - 1;
        bool Inside(int j) => Math.Abs(a - step[j]) <= q;

        // Start from the arithmetic estimate and settle on the exact boundary with the very test the recursion uses.
        int low = Math.Clamp((int)Math.Ceiling((a - q) * n), 0, n);
        while (low > 0 && Inside(low - 1))
        {
            low--;
        }

        while (low <= n && !Inside(low) && step[low] < a)
        {
            low++;
        }

        int high = Math.Clamp((int)Math.Floor((a + q) * n), 0, n);
        while (high < n && Inside(high + 1))
        {
            high++;
        }

        while (high >= 0 && !Inside(high) && step[high] > a)
        {
            high--;
        }

        return low <= n && high >= 0 && Inside(low) && Inside(high) && low <= high ? (low, high) : (1, 0);
    }

    /// <summary>Kolmogorov's limiting upper tail <c>Q_KS(λ) = 2 Σ (−1)^{j−1} e^{−2j²λ²}</c>.</summary>
    public static double KolmogorovUpperTail(double lambda)
    {
        if (double.IsNaN(lambda))
        {
            return double.NaN;
        }

        if (lambda <= 0.0)
        {
            return 1.0;
        }

        if (lambda < 1.0)
        {
            // The alternating series converges slowly here; the theta-function form converges fast.
            double s = 0.0;
            for (int j = 1; j <= 20; j++)
            {
                double k = (2 * j) - 1;
                s += Math.Exp(-k * k * Math.PI * Math.PI / (8.0 * lambda * lambda));
            }

            return Math.Clamp(1.0 - (Math.Sqrt(2.0 * Math.PI) / lambda * s), 0.0, 1.0);
        }

        double sum = 0.0;
        for (int j = 1; j <= 100; j++)
        {
            double term = Math.Exp(-2.0 * j * j * lambda * lambda);
            sum += (j % 2 == 1 ? 1.0 : -1.0) * term;
            if (term < 1e-300)
            {
                break;
            }
        }

        return Math.Clamp(2.0 * sum, 0.0, 1.0);
    }

    /// <summary>Critical value <c>c(α) = √(−ln(α/2)/2)</c> of the Kolmogorov limit.</summary>
    public static double CriticalConstant(double alpha) => Math.Sqrt(-Math.Log(alpha / 2.0) / 2.0);
}
