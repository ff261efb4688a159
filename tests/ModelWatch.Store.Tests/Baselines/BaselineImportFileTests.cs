using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Store.Tests.Baselines;

/// <summary>What <c>baseline import</c> stores is checked whole first; every problem is listed at once with its path.</summary>
public sealed class BaselineImportFileTests
{
    private static readonly DesignLayout Layout = new(["route_km", "stops"], "minutes", intercept: true);

    [Fact]
    public void A_consistent_file_imports_with_its_covariance()
    {
        ImportedCoefficients imported = BaselineImportFile.Parse("ok.json", """
            { "coefficients": { "(intercept)": 4.1, "route_km": 2.2, "stops": 2.9 },
              "covariance": [[0.04, 0.001, 0.0], [0.001, 0.01, 0.002], [0.0, 0.002, 0.09]],
              "standard_errors": { "(intercept)": 0.2, "route_km": 0.1, "stops": 0.3 },
              "n": 400, "residual_df": 397, "residual_sd": 1.3 }
            """, Layout);

        Assert.Equal(397, imported.ResidualDegreesOfFreedom);
        Assert.Equal(0.09, imported.Covariance![2][2]);
    }

    [Fact]
    public void Every_problem_is_listed_at_once_with_its_path()
    {
        var ex = Assert.Throws<BaselineException>(() => BaselineImportFile.Parse("bad.json", """
            { "coefficients": { "(intercept)": 4.1, "route_km": 2.2, "stops": 2.9, "route_km": 9.9 },
              "covariance": [[0.04, 0.001, 0.0], [0.001, -0.01, 0.002], [0.0, 0.002, 0.09]],
              "standard_errors": { "(intercept)": -0.2, "route_km": 0.1, "stops": 0.3 },
              "n": 400, "residual_df": 380, "residual_sd": 1.3, "learning_rate": 0.1 }
            """, Layout));

        string[] lines = ex.Message.Split(Environment.NewLine);
        Assert.Contains("bad.json: coefficients.route_km: the key appears more than once (which one is meant cannot be told)", lines);
        Assert.Contains(lines, l => l.StartsWith("bad.json: learning_rate: not a field of the import format (fields: coefficients, covariance, standard_errors, n, residual_sd, residual_df, intercept)", StringComparison.Ordinal));
        Assert.Contains("bad.json: standard_errors.(intercept): -0.2 is not a positive finite number", lines);
        Assert.Contains(lines, l => l.StartsWith("bad.json: covariance: not positive definite (the Cholesky factorisation fails at term 'route_km', the 2. of 3)", StringComparison.Ordinal));
        Assert.Contains("bad.json: residual_df: 380 is not n − p = 400 − 3 = 397", lines);
    }

    [Fact]
    public void A_covariance_that_is_not_symmetric_or_disagrees_with_the_standard_errors_is_refused()
    {
        var asymmetric = Assert.Throws<BaselineException>(() => BaselineImportFile.Parse("a.json", """
            { "coefficients": { "(intercept)": 4.1, "route_km": 2.2, "stops": 2.9 },
              "covariance": [[0.04, 0.001, 0.0], [0.002, 0.01, 0.002], [0.0, 0.002, 0.09]] }
            """, Layout));
        Assert.Contains("a.json: covariance[0][1]: 0.001 differs from covariance[1][0] 0.002; a covariance is symmetric ((intercept), route_km)", asymmetric.Message, StringComparison.Ordinal);

        // Singular: the third coefficient's variance is exactly explained by the first two (a perfectly collinear pair).
        var singular = Assert.Throws<BaselineException>(() => BaselineImportFile.Parse("s.json", """
            { "coefficients": { "(intercept)": 4.1, "route_km": 2.2, "stops": 2.9 },
              "covariance": [[1, 1, 0], [1, 1, 0], [0, 0, 1]] }
            """, Layout));
        Assert.Contains("s.json: covariance: not positive definite (the Cholesky factorisation fails at term 'route_km'", singular.Message, StringComparison.Ordinal);

        var disagreeing = Assert.Throws<BaselineException>(() => BaselineImportFile.Parse("d.json", """
            { "coefficients": { "(intercept)": 4.1, "route_km": 2.2, "stops": 2.9 },
              "covariance": [[0.04, 0, 0], [0, 0.01, 0], [0, 0, 0.09]],
              "standard_errors": { "(intercept)": 0.2, "route_km": 0.5, "stops": 0.3 } }
            """, Layout));
        Assert.Contains("d.json: standard_errors.route_km: 0.5 disagrees with the covariance, whose diagonal gives 0.1", disagreeing.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Scales_and_counts_must_be_positive_and_whole()
    {
        var ex = Assert.Throws<BaselineException>(() => BaselineImportFile.Parse("c.json", """
            { "coefficients": { "(intercept)": 4.1, "route_km": 2.2, "stops": 2.9 }, "n": 2.5, "residual_sd": 0, "residual_df": -4 }
            """, Layout));

        Assert.Contains("c.json: n: must be a positive whole number", ex.Message, StringComparison.Ordinal);
        Assert.Contains("c.json: residual_df: must be a positive whole number", ex.Message, StringComparison.Ordinal);
        Assert.Contains("c.json: residual_sd: must be a positive finite number", ex.Message, StringComparison.Ordinal);

        var few = Assert.Throws<BaselineException>(() => BaselineImportFile.Parse("f.json", """
            { "coefficients": { "(intercept)": 4.1, "route_km": 2.2, "stops": 2.9 }, "n": 3 }
            """, Layout));
        Assert.Contains("f.json: n: 3 training rows cannot fit 3 coefficients (n must be above p)", few.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void The_fit_commands_output_is_read_with_its_own_fields_and_nothing_else()
    {
        var ex = Assert.Throws<BaselineException>(() => BaselineImportFile.Parse("fit.json", """
            { "n": 400, "p": 3, "rank": 3, "intercept": true,
              "coefficients": [ { "term": "(intercept)", "estimate": 4.1, "std_error": 0.2, "t": 20.5, "p_value": 0, "note": "x" },
                                { "term": "route_km", "estimate": 2.2, "std_error": 0.1 },
                                { "term": "stops", "estimate": 2.9, "std_error": 0.3 } ],
              "residual_sd": 1.3, "r_squared": 0.9, "extra": 1 }
            """, Layout));

        Assert.Contains("fit.json: coefficients[0].note: not a field of a term (fields: term, estimate, std_error, t, p_value)", ex.Message, StringComparison.Ordinal);
        Assert.Contains("fit.json: extra: not a field of the output of 'modelwatch fit --format json'", ex.Message, StringComparison.Ordinal);
    }
}
