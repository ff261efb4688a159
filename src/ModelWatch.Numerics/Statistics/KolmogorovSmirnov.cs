namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Two-sample Kolmogorov–Smirnov test with one pinned p-value rule: the exact no-ties distribution
/// (Hodges 1958; the lattice-path recursion used by R's <c>psmirnov</c>) when <c>n·m ≤ </c><see cref="ExactLimit"/>,
/// otherwise the plain Kolmogorov limit <c>Q_KS(√(nm/(n+m))·D)</c> with no finite-sample correction.
/// </summary>
public static class KolmogorovSmirnov
{
    /// <summary>Largest <c>n·m</c> for which the exact distribution is used (about a millisecond of work).</summary>
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

        double[] a = [.. first];
        double[] b = [.. second];
        Array.Sort(a);
        Array.Sort(b);
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
        var u = new double[n + 1];
        for (int j = 0; j <= n; j++)
        {
            u[j] = j / nd > q ? 0.0 : 1.0;
        }

        for (int i = 1; i <= m; i++)
        {
            double w = i / (double)(i + n);
            u[0] = i / md > q ? 0.0 : w * u[0];
            for (int j = 1; j <= n; j++)
            {
                u[j] = Math.Abs((i / md) - (j / nd)) > q ? 0.0 : (w * u[j]) + u[j - 1];
            }
        }

        return Math.Clamp(1.0 - u[n], 0.0, 1.0);
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
