using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.LinearAlgebra;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// The persisted Page CUSUMs of the residuals check (methods.md §3.2). Each run consumes only the rows new since
/// the previous run, predicted from the fit of every row consumed before (reference rows included):
/// <list type="bullet">
/// <item>bias: their mean error, standardized with <c>s_ref·√(1/m + ‖R⁻ᵀx̄‖²)</c> and mapped to a normal score. These
/// block prediction errors are independent from run to run under no change (the block form of recursive residuals,
/// Brown, Durbin &amp; Evans 1975), so the tabulated ARL applies;</item>
/// <item>variance: the rise of the running RSS, <c>Q = RSS_after − RSS_before</c> (a sum of m squared recursive
/// residuals), against the pooled variance before, <c>F = (Q/m)/(RSS_before/df)</c> ~ F(m, df), mapped to a normal
/// score. The ratios RSS_before/RSS_after of independent χ² increments are mutually independent (Lukacs 1955), so these
/// inputs are independent too.</item>
/// </list>
/// Both use k and h from the budget; each sum resets after its alarm.
/// </summary>
public static class ResidualCusum
{
    /// <summary>Advances the CUSUMs with this run's new rows.</summary>
    public static (Finding Finding, CheckState State) Step(CheckInput input, CheckState state)
    {
        (IReadOnlyList<Finding> findings, CheckState next) = StepBoth(input, state);
        return (findings[0], next);
    }

    /// <summary>Advances both CUSUMs; the bias finding comes first, the variance finding (when it ran) second.</summary>
    public static (IReadOnlyList<Finding> Findings, CheckState State) StepBoth(CheckInput input, CheckState state)
    {
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(state);
        const string check = CheckNames.Residuals;
        BaselineReference baseline = input.Baseline;
        DesignLayout layout = baseline.ToLayout();
        AugmentedFactor? running = state.SequentialFactor is { } rows
            ? AugmentedFactor.FromRowMajor(layout, state.SequentialRowCount, rows.SelectMany(r => r).ToArray())
            : baseline.ToFactor();
        if (running is null)
        {
            return ([Skip(check, "cusum", SkipReasons.BaselineIncomplete, "the baseline stores no reference factor, so the sequential CUSUMs cannot run")], state);
        }

        AugmentedFactor? fresh = input.Window.NewRows;
        if (fresh is not null && state.LastRunEnd is { } lastEnd && input.WindowStart < lastEnd && fresh.RowCount == input.Window.RowsAccepted && state.CusumRuns > 0)
        {
            // Every row of an overlapping window came marked as new: counting rows twice would make successive inputs
            // dependent and the false-alarm rate unknown, so the CUSUM waits rather than guess.
            return ([Skip(check, "cusum", SkipReasons.RowsNotMarked, "the window overlaps the previous run's but no row was marked as already seen (AddRow newSinceLastRun: false), so the CUSUM cannot tell new rows from old ones")], state with { LastRunEnd = input.WindowEnd });
        }

        double h = FalseAlarmBudget.CusumThreshold(input.Thresholds);
        double k = input.Thresholds.CusumReference;
        if (fresh is null || fresh.RowCount == 0)
        {
            return ([new Finding
            {
                Check = check,
                Statistic = "cusum",
                Value = Math.Max(state.CusumUpper, state.CusumLower),
                Threshold = h,
                Severity = Severity.Ok,
                RequiresPersistence = false,
                Explanation = "no rows new since the previous run; the CUSUM waits",
            }], state with { LastRunEnd = input.WindowEnd });
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
        double error = fresh.Columns[layout.Features.Count].Mean - xBar.Select((x, j) => x * b[j]).Sum();
        double[] v = UpperTriangular.SolveTransposed(RegressionMath.R(running), xBar);
        double t = error / (s * Math.Sqrt((1.0 / m) + v.Sum(a => a * a)));
        double z = StandardDistributions.StudentTToNormalScore(t, baseline.ResidualDegreesOfFreedom);
        double upper = state.CusumUpper;
        double lower = state.CusumLower;
        bool alarm = PageCusum.Step(ref upper, ref lower, z, k, h);
        double peak = Math.Max(upper, lower);
        string direction = upper >= lower ? "above" : "below";
        var bias = new Finding
        {
            Check = check,
            Statistic = "cusum",
            Value = peak,
            Threshold = h,
            Severity = alarm ? Severity.Critical : peak > h / 2.0 ? Severity.Warning : Severity.Ok,
            EffectSize = Finite(error / s),
            EffectSizeName = "run_bias_in_reference_sd",
            RequiresPersistence = false,
            Explanation = alarm
                ? Fmt($"persistent bias: outcomes have run {direction} the model's predictions; CUSUM {Num(peak)} crossed h = {Num(h)} (set for one false alarm per {Num(FalseAlarmBudget.CusumTargetArl(input.Thresholds))} runs); this run's mean error {Num(error / s)} SD over {m} new rows")
                : Fmt($"CUSUM of per-run bias at {Num(peak)} of h = {Num(h)}; this run's mean error {Num(error / s)} SD over {m} new rows (z = {Num(z)})"),
            Details = Details(("z", z), ("upper", upper), ("lower", lower), ("new_rows", m), ("reference_k", k)),
        };

        AugmentedFactor merged = RegressionMath.Merge(running, fresh);
        (Finding variance, double vUpper, double vLower, bool vAlarm) = Variance(input, state, running, merged, h, k);
        CheckState next = state with
        {
            CusumUpper = alarm ? 0.0 : upper,
            CusumLower = alarm ? 0.0 : lower,
            VarianceCusumUpper = vAlarm ? 0.0 : vUpper,
            VarianceCusumLower = vAlarm ? 0.0 : vLower,
            CusumRuns = alarm ? 0 : state.CusumRuns + 1,
            CusumAlarms = state.CusumAlarms + (alarm ? 1 : 0),
            VarianceCusumAlarms = state.VarianceCusumAlarms + (vAlarm ? 1 : 0),
            SequentialFactor = merged.ToRows(),
            SequentialRowCount = merged.RowCount,
            LastRunEnd = input.WindowEnd,
        };
        return ([bias, variance], next);
    }

    private static (Finding Finding, double Upper, double Lower, bool Alarm) Variance(CheckInput input, CheckState state, AugmentedFactor before, AugmentedFactor after, double h, double k)
    {
        double m = after.RowCount - before.RowCount;
        double df = before.RowCount - before.Layout.ParameterCount;
        double pooled = before.ResidualSumOfSquares / df;
        double f = (after.ResidualSumOfSquares - before.ResidualSumOfSquares) / m / pooled;
        double tail = Math.Clamp(StandardDistributions.FisherUpper(f, m, df), 1e-300, 1.0 - 1e-16);
        double z = StandardDistributions.NormalUpperQuantile(tail);
        double upper = state.VarianceCusumUpper;
        double lower = state.VarianceCusumLower;
        bool alarm = PageCusum.Step(ref upper, ref lower, z, k, h);
        double peak = Math.Max(upper, lower);
        string direction = upper >= lower ? "larger" : "smaller";
        var finding = new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "variance_cusum",
            Value = peak,
            Threshold = h,
            Severity = alarm ? Severity.Critical : peak > h / 2.0 ? Severity.Warning : Severity.Ok,
            EffectSize = Finite(f),
            EffectSizeName = "run_variance_ratio",
            RequiresPersistence = false,
            Explanation = alarm
                ? Fmt($"persistent change of spread: errors of new rows have run {direction} than before; variance CUSUM {Num(peak)} crossed h = {Num(h)}; this run's variance {Num(f)}× the pooled one over {m} new rows")
                : Fmt($"CUSUM of per-run variance at {Num(peak)} of h = {Num(h)}; this run's variance {Num(f)}× the pooled one (z = {Num(z)})"),
            Details = Details(("z", z), ("upper", upper), ("lower", lower), ("new_rows", m)),
        };
        return (finding, upper, lower, alarm);
    }
}
