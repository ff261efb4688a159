using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// <c>error</c> (methods.md §6): RMSE, MAE and bias of the deployed coefficients on every window row (single pass),
/// the exact decomposition of their MSE into noise, level drift and slope drift (needs the refit), the out-of-sample
/// R², and Chow's predictive test of the window rows against the reference rows. Critical needs MSE growth above
/// the floor and a predictive-test p-value within the budget.
/// </summary>
public static class ErrorCheck
{
    /// <summary>The decomposition for a window, or null without a full-rank refit.</summary>
    public static ErrorDecomposition? Decompose(BaselineReference baseline, WindowSummary window)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(window);
        FitSummary? fit = window.Fit;
        if (fit is null || !fit.IsFullRank)
        {
            return null;
        }

        double m = window.RowsAccepted;
        double[] b0 = baseline.CoefficientVector();
        double[] delta = RegressionMath.Estimates(fit).Select((b, j) => b - b0[j]).ToArray();
        double drift = RegressionMath.NormSquaredOfProduct(RegressionMath.R(fit.Factor), delta) / m;
        double refit = fit.ResidualSumOfSquares / m;
        if (!baseline.Intercept)
        {
            return new ErrorDecomposition(refit + drift, refit, 0.0, drift);
        }

        // With an intercept the refit's residuals have mean zero, so mean(e0) = x̄ᵀδ exactly.
        double[] xBar = RegressionMath.MeanRow(fit.Layout, fit.Factor);
        double level = xBar.Select((x, j) => x * delta[j]).Sum();
        return new ErrorDecomposition(refit + drift, refit, level * level, drift - (level * level));
    }

    /// <summary>Runs the check.</summary>
    public static CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        const string check = CheckNames.Error;
        CheckState state = input.CurrentState;
        if (!input.FixedSampleDue)
        {
            return NotDue(check, state, "mse_growth", "the error test runs");
        }

        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        double m = window.RowsAccepted;
        double mse = window.DeployedErrorSumOfSquares / m;
        double s2Ref = baseline.ResidualStandardDeviation * baseline.ResidualStandardDeviation;
        double growth = (mse / s2Ref) - 1.0;
        double bias = window.DeployedErrorSum / m;
        double r2Os = 1.0 - (window.DeployedErrorSumOfSquares / window.OutcomeDeviationSumOfSquares);
        ErrorDecomposition? parts = Decompose(baseline, window);
        (double noise, double level, double slopes) = parts?.SharesOfIncrease(s2Ref) ?? (double.NaN, double.NaN, double.NaN);
        var details = Details(
            ("rmse", Math.Sqrt(mse)),
            ("mae", window.DeployedAbsoluteErrorSum / m),
            ("bias", bias),
            ("mse_deployed", mse),
            ("mse_reference", s2Ref),
            ("mse_noise", parts?.RefitMse ?? double.NaN),
            ("mse_level_drift", parts?.BiasSquared ?? double.NaN),
            ("mse_slope_drift", parts?.SlopeDrift ?? double.NaN),
            ("share_noise", noise),
            ("share_level_drift", level),
            ("share_slope_drift", slopes),
            ("r2_out_of_sample", r2Os));

        string split = double.IsNaN(noise)
            ? "no increase to split"
            : Fmt($"{Pct(level + slopes)} of the error increase comes from coefficient drift (level {Pct(level)}, slopes {Pct(slopes)}), {Pct(noise)} from noise");
        double alpha = input.Alpha;
        AugmentedFactor? reference = baseline.ToFactor();
        double pValue = double.NaN;
        double f = double.NaN;
        if (reference is not null && window.Factor is not null && reference.RowCount > baseline.ToLayout().ParameterCount)
        {
            int p = baseline.ToLayout().ParameterCount;
            AugmentedFactor pooled = RegressionMath.Merge(reference, window.Factor);
            double rssRef = reference.ResidualSumOfSquares;
            double dfRef = reference.RowCount - p;
            f = (pooled.ResidualSumOfSquares - rssRef) / m / (rssRef / dfRef);
            pValue = StandardDistributions.FisherUpper(f, m, dfRef);
            details["chow_predictive_f"] = f;
            details["chow_predictive_df_denominator"] = dfRef;
        }

        bool practical = growth >= input.Thresholds.MseGrowthFloor;
        Severity severity = double.IsNaN(pValue)
            ? (practical ? Severity.Warning : Severity.Ok)
            : Grade(pValue, alpha, input.Thresholds.WarningAlpha, practical);
        string test = double.IsNaN(pValue) ? "no reference factor for Chow's predictive test" : Fmt($"Chow predictive F = {Num(f)}, {P(pValue)}");
        var finding = new Finding
        {
            Check = check,
            Statistic = "chow_predictive",
            Value = Finite(f),
            PValue = Finite(pValue),
            Threshold = alpha,
            Severity = severity,
            EffectSize = Finite(growth),
            EffectSizeName = "relative_mse_growth",
            Explanation = Fmt($"deployed RMSE {Num(Math.Sqrt(mse))} against reference {Num(baseline.ResidualStandardDeviation)} ({(growth >= 0 ? "+" : "")}{Pct(growth)} MSE); {split}; {test}"),
            Details = details,
        };
        return new CheckResult { Check = check, State = state with { LastTestedWindowEnd = input.WindowEnd }, Findings = [finding] };
    }
}
