using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Sequential;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.LinearAlgebra;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Residuals;

/// <summary>
/// The residuals check's two Page (1954) CUSUMs. Each run consumes only the rows new since the previous run,
/// predicted from the fit of every row consumed before (reference rows included):
/// <list type="bullet">
/// <item>bias: their mean error, standardized with <c>s_ref·√(1/m + ‖R⁻ᵀx̄‖²)</c> and mapped to a normal score. These
/// block prediction errors are independent from run to run under no change (the block form of recursive residuals,
/// Brown, Durbin &amp; Evans 1975, JRSS B 37:149–192), so the tabulated ARL applies;</item>
/// <item>variance: the rise of the running RSS, <c>Q = RSS_after − RSS_before</c> (a sum of m squared recursive
/// residuals), against the pooled variance before, <c>F = (Q/m)/(RSS_before/df)</c> ~ F(m, df), mapped to a normal
/// score; the ratios of successive running RSS are mutually independent (Lukacs 1955, from memory), so these inputs
/// are independent too.</item>
/// </list>
/// Each uses k and the h of its share of the budget; each sum resets after its alarm. From an alarm until both sums are
/// back at zero, new rows stay out of the running fit: the fit stays what it was before the shift, the sums keep
/// signalling while it lasts, and its end is not mistaken for a new shift the other way.
/// </summary>
internal static class ResidualCusums
{
    public static (IReadOnlyList<Finding> Findings, ResidualsState State) Step(CheckInput input, ResidualsState state)
    {
        const string check = CheckNames.Residuals;
        BaselineReference baseline = input.Baseline;
        DesignLayout layout = baseline.ToLayout();
        AugmentedFactor? running = state.Running?.ToFactor(layout) ?? baseline.ToFactor();
        if (running is null)
        {
            return ([Skip(check, "cusum", SkipReasons.BaselineIncomplete, "the baseline stores no reference factor, so the sequential CUSUMs cannot run")], state);
        }

        if (Increment.Unmarked(input, check, "cusum") is { } unmarked)
        {
            return ([unmarked], state);
        }

        double h = FalseAlarmBudget.CusumThreshold(input.Thresholds);
        double k = input.Thresholds.CusumReference;
        if (Increment.Of(input) is not { } fresh)
        {
            return ([new Finding
            {
                Check = check,
                Statistic = "cusum",
                Value = state.Bias.Peak,
                Limit = h,
                Severity = Severity.Ok,
                RequiresPersistence = false,
                Explanation = Fmt($"no rows new since the previous run; the CUSUM waits at {Num(state.Bias.Peak)} of h = {Num(h)}"),
            }], state);
        }

        FitSummary fit = LeastSquaresFit.Fit(running);
        if (!fit.IsFullRank || fit.ResidualDegreesOfFreedom <= 0)
        {
            return ([Skip(check, "cusum", SkipReasons.RankDeficient, "the rows consumed so far do not determine every coefficient, so the CUSUM cannot predict new rows")], state);
        }

        double m = fresh.RowCount;
        double s = baseline.ResidualStandardDeviation;
        double[] b = RegressionMath.Estimates(fit);
        double[] xBar = RegressionMath.MeanRow(layout, fresh);
        double error = RegressionMath.MeanError(layout, fresh, b);
        double[] v = UpperTriangular.SolveTransposed(RegressionMath.R(running), xBar);
        double t = error / (s * Math.Sqrt((1.0 / m) + v.Sum(a => a * a)));
        double z = StandardDistributions.StudentTToNormalScore(t, baseline.ResidualDegreesOfFreedom);
        (CusumSums bias, bool alarm, CusumSums crossed) = state.Bias.Step(z, k, h);
        string direction = crossed.Upper >= crossed.Lower ? "above" : "below";
        var biasFinding = new Finding
        {
            Check = check,
            Statistic = "cusum",
            Value = crossed.Peak,
            Limit = h,
            Severity = GradeCusum(alarm, practical: true, crossed.Peak, h),
            EffectSize = Finite(error / s),
            EffectSizeName = "run_bias_in_reference_sd",
            RequiresPersistence = false,
            Explanation = alarm
                ? Fmt($"persistent bias: outcomes have run {direction} the model's predictions; CUSUM {Num(crossed.Peak)} crossed h = {Num(h)} (set for one false alarm per {Num(FalseAlarmBudget.CusumTargetArl(input.Thresholds))} runs); this run's mean error {Num(error / s)} SD over {m} new rows")
                : Fmt($"CUSUM of per-run bias at {Num(crossed.Peak)} of h = {Num(h)}; this run's mean error {Num(error / s)} SD over {m} new rows (z = {Num(z)})"),
            Details = Details(("z", z), ("upper", crossed.Upper), ("lower", crossed.Lower), ("new_rows", m), ("reference_k", k)),
        };

        AugmentedFactor merged = RegressionMath.Merge(running, fresh);
        (Finding varianceFinding, CusumSums variance) = Variance(input, state.Variance, running, merged, h, k);

        bool alarmed = bias.Alarms > state.Bias.Alarms || variance.Alarms > state.Variance.Alarms;
        return ([biasFinding, varianceFinding], state with
        {
            Running = StoredFactor.Of(state.Quarantined || alarmed ? running : merged),
            Bias = bias,
            Variance = variance,
            Quarantined = Quarantine.After(state.Quarantined, alarmed, [bias, variance]),
        });
    }

    private static (Finding Finding, CusumSums Sums) Variance(CheckInput input, CusumSums sums, AugmentedFactor before, AugmentedFactor after, double h, double k)
    {
        double m = after.RowCount - before.RowCount;
        double df = before.RowCount - before.Layout.ParameterCount;
        double pooled = before.ResidualSumOfSquares / df;
        double f = (after.ResidualSumOfSquares - before.ResidualSumOfSquares) / m / pooled;
        double z = StandardDistributions.UpperTailToNormalScore(StandardDistributions.FisherUpper(f, m, df));
        (CusumSums next, bool alarm, CusumSums crossed) = sums.Step(z, k, h);
        string direction = crossed.Upper >= crossed.Lower ? "larger" : "smaller";
        var finding = new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "variance_cusum",
            Value = crossed.Peak,
            Limit = h,
            Severity = GradeCusum(alarm, practical: true, crossed.Peak, h),
            EffectSize = Finite(f),
            EffectSizeName = "run_variance_ratio",
            RequiresPersistence = false,
            Explanation = alarm
                ? Fmt($"persistent change of spread: errors of new rows have run {direction} than before; variance CUSUM {Num(crossed.Peak)} crossed h = {Num(h)}; this run's variance {Num(f)}× the pooled one over {m} new rows")
                : Fmt($"CUSUM of per-run variance at {Num(crossed.Peak)} of h = {Num(h)}; this run's variance {Num(f)}× the pooled one (z = {Num(z)})"),
            Details = Details(("z", z), ("upper", crossed.Upper), ("lower", crossed.Lower), ("new_rows", m)),
        };
        return (finding, next);
    }
}
