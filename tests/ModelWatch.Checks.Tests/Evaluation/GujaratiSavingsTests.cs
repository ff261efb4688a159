using ModelWatch.Checks.Coefficients;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.PredictionError;
using ModelWatch.Checks.Residuals;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Tests.Evaluation;

/// <summary>
/// The deployed 1970–81 savings model scored on 1982–95: US savings on disposable income (Gujarati &amp; Porter 2009,
/// Basic Econometrics 5e, Table 8.10 and the Chow test example of §8.7; the 1982 and 1995 rows from memory, confirmed
/// by the book's RSS values and F = 10.69). Values beyond the book's are computed with R 4.2.2 and lmtest 0.9-40 by
/// tests/ModelWatch.Numerics.Tests/TestData/References/statistics.R (statistics-r.out beside it).
/// </summary>
public sealed class GujaratiSavingsTests
{
    private static readonly double[] Savings = [61, 68.6, 63.6, 89.6, 97.6, 104.4, 96.4, 92.5, 112.6, 130.1, 161.8, 199.1, 205.5, 167, 235.7, 206.2, 196.5, 168.4, 189.1, 187.8, 208.7, 246.4, 272.6, 214.4, 189.4, 249.3];
    private static readonly double[] Income = [727.1, 790.2, 855.3, 965, 1054.2, 1159.2, 1273, 1401.4, 1580.1, 1769.5, 1973.3, 2200.2, 2347.3, 2522.4, 2810, 3002, 3187.6, 3363.1, 3640.8, 3894.5, 4166.8, 4343.7, 4613.7, 4790.2, 5021.7, 5320.8];
    private static readonly DesignLayout Layout = new(["income"], "savings", intercept: true);
    private static readonly CheckThresholds Thresholds = new() { MinimumRows = 5, AlphaOverride = 0.01 };

    private static (BaselineReference Baseline, WindowSummary Window) Build()
    {
        var builder = new BaselineBuilder(Layout, new BaselineBuilderOptions());
        for (int i = 0; i < 12; i++)
        {
            builder.AddRow([Income[i]], Savings[i]);
        }

        BaselineReference baseline = builder.Build(BaselineOrigin.Fitted);
        var window = new WindowSummaryBuilder(Layout, baseline, new WindowSummaryOptions());
        for (int i = 12; i < 26; i++)
        {
            window.AddRow([Income[i]], Savings[i]);
        }

        return (baseline, window.Build());
    }

    private static CheckInput Input()
    {
        (BaselineReference baseline, WindowSummary window) = Build();
        return new CheckInput { Baseline = baseline, Window = window, WindowStart = DateTimeOffset.UnixEpoch, WindowEnd = DateTimeOffset.UnixEpoch.AddDays(1), Thresholds = Thresholds };
    }

    [Fact]
    public void Chow_and_Wald_match_the_published_and_computed_values()
    {
        CheckResult result = CoefficientsCheck.Instance.Run(Input());

        // Chow F(2,22) = 10.690059, p = 5.7076e-4 (statistics-r.out); Gujarati & Porter 2009, §8.7, print F = 10.69.
        Finding chow = result.Findings.Single(f => f.Statistic == "chow");
        Assert.Equal(10.690059, chow.Value!.Value, 6);
        Assert.Equal(5.7076e-4, chow.PValue!.Value, 8);

        // Wald with both covariances W = 31.26770, p(χ²₂) = 1.623e-7 (statistics-r.out).
        Finding wald = result.Findings.Single(f => f.Statistic == "wald");
        Assert.Equal(31.26770, wald.Value!.Value, 5);
        Assert.Equal(1.623e-7, wald.Details["chi2_p_value"], 10);
        Assert.Equal(Severity.Critical, wald.Severity);
        Assert.Contains(result.Findings, f => f.Subject == "income" && f.Explanation.StartsWith("coefficient of income on the window's refit moved from 0.0803", StringComparison.Ordinal));
    }

    [Fact]
    public void Error_metrics_decomposition_and_predictive_test_match()
    {
        CheckResult result = ErrorCheck.Instance.Run(Input());
        Finding f = Assert.Single(result.Findings);

        // Computed in statistics-r.out: MSE_dep 13455.6676 = 714.6586 + 9117.4040 + 3623.6049; RMSE 115.99857;
        // MAE 99.03827; bias −95.48510; R²_OS −0.16183; Chow predictive F(14,10) = 8.588587, p = 8.308e-4.
        Assert.Equal(13455.6676, f.Details["mse_deployed"], 3);
        Assert.Equal(714.6586, f.Details["mse_noise"], 3);
        Assert.Equal(9117.4040, f.Details["mse_level_drift"], 3);
        Assert.Equal(3623.6049, f.Details["mse_slope_drift"], 3);
        Assert.Equal(115.99857, f.Details["rmse"], 5);
        Assert.Equal(99.03827, f.Details["mae"], 5);
        Assert.Equal(-95.48510, f.Details["bias"], 5);
        Assert.Equal(-0.16183, f.Details["r2_out_of_sample"], 5);
        Assert.Equal(8.588587, f.Value!.Value, 6);
        Assert.Equal(8.308e-4, f.PValue!.Value, 7);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Contains("comes from coefficient drift", f.Explanation, StringComparison.Ordinal);
    }

    [Fact]
    public void Bias_t_includes_the_baseline_uncertainty()
    {
        CheckResult result = ResidualsCheck.Instance.Run(Input());

        // Computed in statistics-r.out: ē0 = −95.48510, t = −4.46932, p = 0.00120 on 10 df.
        Finding bias = result.Findings.Single(f => f.Statistic == "bias_t");
        Assert.Equal(-4.46932, bias.Value!.Value, 5);
        Assert.Equal(0.00120, bias.PValue!.Value, 5);
        Assert.Equal(-95.48510, bias.Details["bias"], 5);
    }

    [Fact]
    public void Every_new_row_is_an_extrapolation()
    {
        // statistics-r.out: leverages of the 1982–95 rows against the 1970–81 design run from 0.5033 to 6.3841.
        (BaselineReference baseline, WindowSummary window) = Build();
        Assert.Equal(6.3841, window.MaximumLeverage, 4);

        // 13 of the 14 lie beyond every reference row's leave-one-out leverage as well (same file).
        Assert.Equal(13, window.LeverageAboveReferenceMaximumCount);
    }
}
