using ModelWatch.Numerics.Statistics;
using Xunit;

namespace ModelWatch.Numerics.Tests.Statistics;

public sealed class KolmogorovSmirnovTests
{
    [Fact]
    public void Small_sample_example_matches_exact_and_asymptotic_reference_values()
    {
        // R 4.2.2 ks.test (TestData/References/statistics-r.out): D = 0.23; exact p = 0.528636; Kolmogorov-limit
        // p = 0.599196 (R's asymptotic, the formula pinned here for large samples).
        KolmogorovSmirnovResult result = KolmogorovSmirnov.TwoSample(ReferenceData.KsX, ReferenceData.KsY);
        Assert.True(result.Exact);
        Assert.Equal(0.23, result.Statistic, 12);
        Assert.Equal(0.528636, result.PValue, 6);
        double lambda = Math.Sqrt(25.0 * 20.0 / 45.0) * result.Statistic;
        Assert.Equal(0.599196, KolmogorovSmirnov.KolmogorovUpperTail(lambda), 6);
    }

    [Fact]
    public void Labs_A_and_D_match_the_exact_reference_value()
    {
        // Scholz–Stephens labs A vs D, R 4.2.2 ks.test (statistics-r.out): D = 0.75, exact p = 0.018648.
        KolmogorovSmirnovResult result = KolmogorovSmirnov.TwoSample(ReferenceData.LabA, ReferenceData.LabD);
        Assert.Equal(0.75, result.Statistic, 12);
        Assert.Equal(0.018648, result.PValue, 6);
    }

    [Theory]
    [InlineData(0.10, 1.2239)]
    [InlineData(0.05, 1.3581)]
    [InlineData(0.01, 1.6276)]
    [InlineData(0.001, 1.9495)]
    public void Critical_constants_match_the_table_and_invert_the_limit(double alpha, double c)
    {
        // c(α) = sqrt(−ln(α/2)/2), the Kolmogorov limit's first term set equal to α (values in statistics-r.out).
        Assert.Equal(c, KolmogorovSmirnov.CriticalConstant(alpha), 4);

        // The first term of the series dominates, so Q_KS(c(α)) ≈ α (to the next term, 2e^{−8c²}).
        Assert.Equal(alpha, KolmogorovSmirnov.KolmogorovUpperTail(c), 3);
    }

    [Fact]
    public void Large_samples_use_the_kolmogorov_limit()
    {
        var random = new Random(3);
        double[] a = Enumerable.Range(0, 1000).Select(_ => random.NextDouble()).ToArray();
        double[] b = Enumerable.Range(0, 600).Select(_ => random.NextDouble()).ToArray();
        KolmogorovSmirnovResult result = KolmogorovSmirnov.TwoSample(a, b);
        Assert.False(result.Exact);
        Assert.Equal(KolmogorovSmirnov.KolmogorovUpperTail(Math.Sqrt(600000.0 / 1600.0) * result.Statistic), result.PValue, 14);
    }

    [Fact]
    public void Exact_and_limit_agree_closely_for_moderate_samples()
    {
        // Both are the same distribution; at n = m = 400 the exact tail sits within 0.01 of the limit.
        double d = 0.08;
        double exact = KolmogorovSmirnov.ExactUpperTail(400, 400, d);
        double limit = KolmogorovSmirnov.KolmogorovUpperTail(Math.Sqrt(200.0) * d);
        Assert.InRange(exact - limit, -0.01, 0.01);
    }

    [Theory]
    [InlineData(48, 5000)]
    [InlineData(30, 30)]
    [InlineData(7, 3)]
    [InlineData(1, 400)]
    [InlineData(200, 1000)]
    public void The_banded_recursion_equals_the_full_row_recursion_bit_for_bit(int n, int m)
    {
        // Every attainable D on the n×m lattice, and a value between two of them, each through both recursions.
        for (long k = 0; k <= n * (long)m; k += Math.Max(1, n * m / 400))
        {
            foreach (double d in new[] { k / ((double)n * m), (k + 0.5) / ((double)n * m) })
            {
                Assert.Equal(FullRowUpperTail(n, m, d), KolmogorovSmirnov.ExactUpperTail(n, m, d));
            }
        }
    }

    /// <summary>The lattice-path recursion over every cell of every row: the definition the banded sweep must reproduce.</summary>
    private static double FullRowUpperTail(int n, int m, double d)
    {
        if (m > n)
        {
            (n, m) = (m, n);
        }

        double md = m;
        double nd = n;
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
}
