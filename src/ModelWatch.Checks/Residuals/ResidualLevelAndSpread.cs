using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Residuals;

/// <summary>The residuals check's per-run tests of level and spread on the window.</summary>
internal static class ResidualLevelAndSpread
{
    /// <summary>
    /// The bias t of the deployed coefficients, <c>ē0/(s_ref·√(1/m + x̄ᵀV_ref x̄/s²_ref))</c> on t(n − p): the baseline's own
    /// uncertainty is in the null, so large windows do not flag b0's estimation error.
    /// </summary>
    public static Finding Bias(CheckInput input)
    {
        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        double[,]? vRef = baseline.CovarianceMatrix();
        if (vRef is null || window.Factor is null)
        {
            return Skip(CheckNames.Residuals, "bias_t", SkipReasons.BaselineIncomplete, "the baseline has no coefficient covariance, so the bias test cannot include its uncertainty and does not run");
        }

        double m = window.RowsAccepted;
        double s = baseline.ResidualStandardDeviation;
        double bias = window.DeployedErrorSum / m;
        double[] xBar = RegressionMath.MeanRow(baseline.ToLayout(), window.Factor);
        double se = Math.Sqrt((s * s / m) + RegressionMath.QuadraticForm(vRef, xBar));
        double t = bias / se;
        double p = StandardDistributions.StudentTTwoSided(t, baseline.ResidualDegreesOfFreedom);
        double effect = bias / s;
        double alpha = input.RunAlpha();
        double critical = StandardDistributions.StudentTTwoSidedQuantile(alpha, baseline.ResidualDegreesOfFreedom);
        double floor = input.Setting(ResidualsCheck.BiasFloor);
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "bias_t",
            Value = Finite(t),
            PValue = Finite(p),
            Alpha = alpha,
            Limit = Finite(critical),
            Severity = Grade(p, alpha, input.Thresholds.WarningAlpha, Math.Abs(effect) >= floor),
            EffectSize = Finite(effect),
            EffectSizeName = "bias_in_reference_sd",
            Explanation = Fmt($"deployed predictions are off by {Num(bias)} on average ({Num(effect)} reference SDs, floor {Num(floor)}): t = {Num(t)} (critical |t| {Num(critical)} at α {Level(alpha)}), {P(p)}"),
            Details = Details(("bias", bias), ("standard_error", se)),
        };
    }

    /// <summary>Brown &amp; Forsythe's (1974) test on the standardized samples; half the spread channel's α.</summary>
    public static Finding Spread(CheckInput input)
    {
        if (!ResidualShape.HasSamples(input, out Finding? skip, "brown_forsythe"))
        {
            return skip!;
        }

        (StatisticalTest test, double ratio) = BrownForsythe.Compare(input.Baseline.ResidualSample, input.Window.ResidualSample);
        double low = input.Setting(ResidualsCheck.SpreadRatioLow);
        double high = input.Setting(ResidualsCheck.SpreadRatioHigh);

        // The floor is on the variance scale, so the spread ratio is squared.
        bool practical = ratio * ratio < low || ratio * ratio > high;
        double alpha = input.RunAlpha(tests: 2);
        double critical = StandardDistributions.FisherUpperQuantile(alpha, test.DegreesOfFreedom1, test.DegreesOfFreedom2);
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "brown_forsythe",
            Value = Finite(test.Statistic),
            PValue = Finite(test.PValue),
            Alpha = alpha,
            Limit = Finite(critical),
            Severity = Grade(test.PValue, alpha, input.Thresholds.WarningAlpha, practical),
            EffectSize = Finite(ratio),
            EffectSizeName = "spread_ratio",
            Explanation = Fmt($"residual spread is {Num(ratio)}× the reference (variance ×{Num(ratio * ratio)}; practical outside {Num(low)}–{Num(high)}): Brown–Forsythe F = {Num(test.Statistic)} (critical {Num(critical)} at α {Level(alpha)}), {P(test.PValue)}"),
        };
    }

    /// <summary>
    /// log(s²_new/s²_ref) with the large-sample variance (κ − 1)(1/df_new + 1/df_ref), κ the pooled residual kurtosis
    /// (Box 1953; Layard 1973, from memory): as powerful as the F test under normal errors, still valid with heavy tails.
    /// Half the spread channel's α.
    /// </summary>
    public static Finding VarianceRatio(CheckInput input)
    {
        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        if (window.Fit is not { IsFullRank: true } fit || fit.ResidualDegreesOfFreedom < 2 || !ResidualShape.HasSamples(input, out _, "variance_ratio"))
        {
            return Skip(CheckNames.Residuals, "variance_ratio", SkipReasons.InsufficientData, "no full-rank refit with residual samples, so the variance ratio cannot be tested");
        }

        double kurtosis = Kurtosis([.. baseline.ResidualSample, .. window.ResidualSample]);
        double ratio = fit.ResidualStandardDeviation * fit.ResidualStandardDeviation / (baseline.ResidualStandardDeviation * baseline.ResidualStandardDeviation);
        double se = Math.Sqrt((kurtosis - 1.0) * ((1.0 / fit.ResidualDegreesOfFreedom) + (1.0 / baseline.ResidualDegreesOfFreedom)));
        double z = Math.Log(ratio) / se;
        double p = StandardDistributions.NormalTwoSided(z);
        double alpha = input.RunAlpha(tests: 2);

        // The ratio itself is the statistic; α gives it two limits, exp(±z_α/2·se); the upper one is reported.
        double upper = Math.Exp(StandardDistributions.NormalUpperQuantile(alpha / 2.0) * se);
        double low = input.Setting(ResidualsCheck.SpreadRatioLow);
        double high = input.Setting(ResidualsCheck.SpreadRatioHigh);
        bool practical = ratio < low || ratio > high;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "variance_ratio",
            Value = Finite(ratio),
            PValue = Finite(p),
            Alpha = alpha,
            Limit = Finite(upper),
            Severity = Grade(p, alpha, input.Thresholds.WarningAlpha, practical),
            EffectSize = Finite(Math.Sqrt(ratio)),
            EffectSizeName = "residual_sd_ratio",
            Explanation = Fmt($"residual variance is {Num(ratio)}× the reference (SD {Num(fit.ResidualStandardDeviation)} against {Num(baseline.ResidualStandardDeviation)}; practical outside {Num(low)}–{Num(high)}): z = {Num(z)}, {P(p)} (kurtosis-adjusted; beyond chance below {Num(1.0 / upper)} or above {Num(upper)} at α {Level(alpha)})"),
            Details = Details(("kurtosis", kurtosis), ("z", z), ("lower_limit", 1.0 / upper)),
        };
    }

    private static double Kurtosis(double[] values)
    {
        double mean = values.Average();
        double m2 = values.Sum(v => (v - mean) * (v - mean)) / values.Length;
        double m4 = values.Sum(v => Math.Pow(v - mean, 4)) / values.Length;
        return m4 / (m2 * m2);
    }
}
