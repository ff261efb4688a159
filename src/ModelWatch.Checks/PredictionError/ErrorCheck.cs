using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.PredictionError;

/// <summary>
/// <c>error</c>: RMSE, MAE and bias of the deployed coefficients on every window row (single pass), the exact
/// decomposition of their MSE into noise, level drift and slope drift (needs the refit), the out-of-sample R²
/// (Campbell &amp; Thompson 2008), and Chow's (1960) predictive test of the window rows against the reference rows. On
/// every run; critical needs MSE growth above the floor and the predictive test within the run's budgeted α.
/// </summary>
public sealed class ErrorCheck : IModelCheck
{
    /// <summary>Relative MSE growth floor (a 10 % worse model is the smallest change worth a page; common practice).</summary>
    public static readonly CheckSetting MseGrowthFloor = new() { Check = CheckNames.Error, Name = "mse_growth_floor", Default = 0.10, Minimum = 0, Maximum = 100, Description = "relative growth of the deployed coefficients' MSE over s²_ref below which nothing pages (common practice)" };

    private ErrorCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static ErrorCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Error;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [MseGrowthFloor];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } = [new("error.chow_predictive", "Chow's predictive test of the window against the reference rows, every run")];

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Error,
        "The deployed coefficients predict the window's outcome worse than at baseline, beyond what chance explains. The decomposition says how much of the increase is noise (a harder window), level drift (an overall bias) and slope drift (changed coefficients).",
        "Read the decomposition shares: mostly noise points to the data, mostly drift points to a changed relationship. Check the error chart for a step rather than a spike.",
        "If drift dominates, follow the coefficients entry; if noise dominates, look at the residuals and data entries. Report the size of the error increase to the model's owner, who decides whether it matters for the business.");

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

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
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
        double alpha = input.RunAlpha();
        AugmentedFactor? reference = baseline.ToFactor();
        double pValue = double.NaN;
        double f = double.NaN;
        double critical = double.NaN;
        if (reference is not null && window.Factor is not null && reference.RowCount > baseline.ToLayout().ParameterCount)
        {
            int p = baseline.ToLayout().ParameterCount;
            AugmentedFactor pooled = RegressionMath.Merge(reference, window.Factor);
            double rssRef = reference.ResidualSumOfSquares;
            double dfRef = reference.RowCount - p;
            f = (pooled.ResidualSumOfSquares - rssRef) / m / (rssRef / dfRef);
            pValue = StandardDistributions.FisherUpper(f, m, dfRef);
            critical = StandardDistributions.FisherUpperQuantile(alpha, m, dfRef);
            details["chow_predictive_f"] = f;
            details["chow_predictive_df_denominator"] = dfRef;
        }

        double floor = input.Setting(MseGrowthFloor);
        bool practical = growth >= floor;
        Severity severity = double.IsNaN(pValue)
            ? (practical ? Severity.Warning : Severity.Ok)
            : Grade(pValue, alpha, input.Thresholds.WarningAlpha, practical);
        string test = double.IsNaN(pValue) ? "no reference factor for Chow's predictive test" : Fmt($"Chow predictive F = {Num(f)} (critical {Num(critical)} at α {Level(alpha)}), {P(pValue)}");
        var finding = new Finding
        {
            Check = Name,
            Statistic = "chow_predictive",
            Value = Finite(f),
            PValue = Finite(pValue),
            Alpha = double.IsNaN(pValue) ? null : alpha,
            Limit = Finite(critical),
            Severity = severity,
            EffectSize = Finite(growth),
            EffectSizeName = "relative_mse_growth",
            Explanation = Fmt($"deployed RMSE {Num(Math.Sqrt(mse))} against reference {Num(baseline.ResidualStandardDeviation)} ({(growth >= 0 ? "+" : "")}{Pct(growth)} MSE, floor {Pct(floor)}); {split}; {test}"),
            Details = details,
        };
        return new CheckResult { Check = Name, State = state, Findings = [finding] };
    }
}
