using ModelWatch.Checks.Collinearity;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Tests.Evaluation;

/// <summary>
/// Longley (1967, JASA 62:819–841; NIST StRD units) VIFs and Belsley, Kuh &amp; Welsch (1980) diagnostics, against
/// values computed with R 4.2.2 and car 3.1-1 by tests/ModelWatch.Numerics.Tests/TestData/References/statistics.R
/// (statistics-r.out beside it).
/// </summary>
public sealed class LongleyCollinearityTests
{
    private static readonly double[][] Rows =
    [
        [60323, 83.0, 234289, 2356, 1590, 107608, 1947], [61122, 88.5, 259426, 2325, 1456, 108632, 1948],
        [60171, 88.2, 258054, 3682, 1616, 109773, 1949], [61187, 89.5, 284599, 3351, 1650, 110929, 1950],
        [63221, 96.2, 328975, 2099, 3099, 112075, 1951], [63639, 98.1, 346999, 1932, 3594, 113270, 1952],
        [64989, 99.0, 365385, 1870, 3547, 115094, 1953], [63761, 100.0, 363112, 3578, 3350, 116219, 1954],
        [66019, 101.2, 397469, 2904, 3048, 117388, 1955], [67857, 104.6, 419180, 2822, 2857, 118734, 1956],
        [68169, 108.4, 442769, 2936, 2798, 120445, 1957], [66513, 110.8, 444546, 4681, 2637, 121950, 1958],
        [68655, 112.6, 482704, 3813, 2552, 123366, 1959], [69564, 114.2, 502601, 3931, 2514, 125368, 1960],
        [69331, 115.7, 518173, 4806, 2572, 127852, 1961], [70551, 116.9, 554894, 4007, 2827, 130081, 1962],
    ];

    private static readonly DesignLayout Layout = new(["GNPDEFL", "GNP", "UNEMP", "ARMED", "POP", "YEAR"], "TOTEMP", intercept: true);

    private static AugmentedFactor Factor()
    {
        var accumulator = new LeastSquaresAccumulator(Layout);
        foreach (double[] row in Rows)
        {
            accumulator.AddRow(row.AsSpan(1), row[0]);
        }

        return accumulator.ToFactor();
    }

    [Fact]
    public void Condition_indices_and_proportions_match_Belsley_Kuh_Welsch()
    {
        // statistics-r.out: η = 1, 9.1417, 12.2557, 25.3366, 230.4239, 1048.0803, 43275.04; the last component carries
        // π = 1.000 (intercept), 1.000 (YEAR), 0.689 (UNEMP), 0.655 (GNP).
        NearDependency d = NearDependency.Of(Factor());
        double[] expected = [1, 9.1417, 12.2557, 25.3366, 230.4239, 1048.0803, 43275.04];
        for (int k = 0; k < expected.Length; k++)
        {
            Assert.Equal(expected[k], d.ConditionIndices[k], expected[k] * 2e-5);
        }

        double[] last = d.Proportions[^1];
        Assert.Equal(1.000, last[0], 3);
        Assert.Equal(1.000, last[6], 3);
        Assert.Equal(0.689, last[3], 3);
        Assert.Equal(0.655, last[2], 3);
    }

    [Fact]
    public void Collinearity_check_reports_the_Longley_VIFs_and_names_the_dependency()
    {
        var builder = new BaselineBuilder(Layout, new BaselineBuilderOptions());
        var window = new WindowSummaryBuilder(Layout, Baseline(builder), new WindowSummaryOptions());
        foreach (double[] row in Rows)
        {
            window.AddRow(row.AsSpan(1), row[0]);
        }

        var input = new CheckInput
        {
            Baseline = Baseline(builder),
            Window = window.Build(),
            WindowStart = DateTimeOffset.UnixEpoch,
            WindowEnd = DateTimeOffset.UnixEpoch.AddDays(1),
            Thresholds = new CheckThresholds { MinimumRows = 5 },
        };

        // 16 rows for 7 coefficients is below 10 per coefficient: VIFs are too noisy to compare, so the test skips.
        CheckResult thin = CollinearityCheck.Instance.Run(input);
        Assert.True(Assert.Single(thin.Findings).Skipped);

        // The same design repeated 5 times has identical VIFs and indices (both are scale-free in the row count).
        var repeated = new WindowSummaryBuilder(Layout, input.Baseline, new WindowSummaryOptions());
        for (int r = 0; r < 5; r++)
        {
            foreach (double[] row in Rows)
            {
                repeated.AddRow(row.AsSpan(1), row[0]);
            }
        }

        CheckResult result = CollinearityCheck.Instance.Run(input with { Window = repeated.Build() });

        // car 3.1-1 vif (statistics-r.out): 135.532, 1788.513, 33.619, 3.589, 399.151, 758.981.
        var expected = new Dictionary<string, double> { ["GNPDEFL"] = 135.532, ["GNP"] = 1788.513, ["UNEMP"] = 33.619, ["ARMED"] = 3.589, ["POP"] = 399.151, ["YEAR"] = 758.981 };
        foreach ((string feature, double vif) in expected)
        {
            Finding f = result.Findings.Single(x => x.Subject == feature);
            Assert.Equal(vif, f.Value!.Value, 5e-4);
            Assert.Equal(1.0, f.EffectSize!.Value, 6);

            // High but not grown: a known collinearity warns, only growth is critical.
            Assert.NotEqual(Severity.Critical, f.Severity);
        }

        Finding condition = result.Findings.Single(x => x.Statistic == "condition_number");
        Assert.Equal(43275.04, condition.Value!.Value, 43275.04 * 2e-5);
        Assert.Contains("(intercept) and YEAR", condition.Explanation, StringComparison.Ordinal);
    }

    private static BaselineReference Baseline(BaselineBuilder builder)
    {
        if (builder.RowCount == 0)
        {
            foreach (double[] row in Rows)
            {
                builder.AddRow(row.AsSpan(1), row[0]);
            }
        }

        return builder.Build(BaselineOrigin.Fitted);
    }
}
