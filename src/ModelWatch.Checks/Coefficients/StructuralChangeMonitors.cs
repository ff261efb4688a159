using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Monitoring;
using ModelWatch.Numerics.Regression;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Coefficients;

/// <summary>
/// The structural-change monitors against the baseline as history (n reference rows, coefficients b0, residual SD
/// s_ref), looked at once per run with the run's window as the moving window (h = K/n for K window rows):
/// <list type="bullet">
/// <item>moving estimates (Chu, Hornik &amp; Kuan 1995; Leisch, Hornik &amp; Kuan 2000), one component per slope, each
/// standardized along its own coefficient so a crossing names it (<see cref="MovingEstimates"/>);</item>
/// <item>OLS-MOSUM: the window's sum of deployed errors over <c>s_ref·√n</c>, which moves with the level of the fit;</item>
/// <item>OLS-CUSUM (Chu, Stinchcombe &amp; White 1996): the sum of the deployed errors of every row consumed since it
/// started (at each epoch, and again after each crossing, so that a shift that has ended stops counting).</item>
/// </list>
/// The moving-window boundaries <c>c·√(2·log₊ x)</c> take c from the simulated null of the run-end design (window h,
/// r runs a window, N runs an epoch; <see cref="MovingWindowNull"/>); the OLS-CUSUM boundary takes Chu, Stinchcombe &amp;
/// White's c. An epoch lasts until the monitoring time reaches e (at most a year), so the moving-window boundary stays
/// flat and a late change is seen as fast as an early one; then the monitors restart. Each monitor's size over an epoch
/// is the channel's yearly share times the epoch's part of a year, the moving-estimates components splitting theirs
/// (Bonferroni).
/// A crossing pages at once when the move also matters for predictions on the newest rows: the named coefficient's own
/// move for a moving-estimates component, the level shift for the OLS monitors (<see cref="PredictiveImpact"/>).
/// </summary>
internal static class StructuralChangeMonitors
{
    public static (IReadOnlyList<Finding> Findings, CoefficientsState State) Step(CheckInput input, CoefficientsState state, PredictiveImpact? recent, bool incrementUsable)
    {
        const string check = CheckNames.Coefficients;
        BaselineReference baseline = input.Baseline;
        DesignLayout layout = baseline.ToLayout();
        CheckThresholds t = input.Thresholds;
        double n = baseline.RowCount;
        double s = baseline.ResidualStandardDeviation;
        if (!(n > layout.ParameterCount) || !(s > 0))
        {
            return ([Skip(check, "moving_estimates", SkipReasons.BaselineIncomplete, "the baseline does not say how many rows it was fitted on, so the monitors have no history length")], state);
        }

        long k = input.Window.RowsAccepted;
        double h = k / n;
        MovingWindowDesign design = Design(t, h);

        // A new epoch restarts the monitors' clock and the OLS-CUSUM sum.
        if (state.EpochRuns >= design.Evaluations)
        {
            state = state with { Epoch = state.Epoch + 1, EpochRuns = 0, EpochRows = 0, CusumRows = 0, CusumErrorSum = 0.0 };
        }

        AugmentedFactor? fresh = incrementUsable ? input.Window.NewRows : null;
        double[] b0 = baseline.CoefficientVector();
        state = state with
        {
            EpochRuns = state.EpochRuns + 1,
            EpochRows = state.EpochRows + (fresh?.RowCount ?? 0),
            CusumRows = state.CusumRows + (fresh?.RowCount ?? 0),
            CusumErrorSum = state.CusumErrorSum + (fresh is null ? 0.0 : fresh.RowCount * RegressionMath.MeanError(layout, fresh, b0)),
        };
        var findings = new List<Finding>();
        double x = 1.0 + (state.EpochRows / n);
        double floor = input.Setting(CoefficientsCheck.DriftImpactFloor);
        bool levelPractical = recent is { } r && r.Level >= floor;
        string levelImpact = CoefficientsCheck.Impact(recent, -1, floor);
        var slopes = Enumerable.Range(0, layout.ParameterCount).Where(j => !(layout.Intercept && j == 0)).ToList();
        double spread = MovingWindowNull.Spread(h);
        MovingWindowNull? nullDistribution = k > layout.ParameterCount ? MovingWindowNull.For(design) : null;
        double levelAlpha = FalseAlarmBudget.EpochAlpha(t, design.Evaluations, monitors: 2);
        if (nullDistribution is not null && input.Window.Factor is { } window
            && MovingEstimates.Evaluate(window, b0, s, n) is { } me)
        {
            // The critical value is simulated per unit of the process's spread and scaled to this run's window, so a window
            // holding more or fewer rows than usual keeps its size.
            double c = nullDistribution.StandardizedCriticalValue(FalseAlarmBudget.EpochAlpha(t, design.Evaluations, monitors: Math.Max(1, slopes.Count))) * spread;
            double boundary = MonitoringBoundary.MovingWindow(c, x);
            foreach (int j in slopes)
            {
                double z = me.Standardized[j];
                double pValue = Math.Min(1.0, slopes.Count * nullDistribution.PValue(Math.Abs(z) / spread / MonitoringBoundary.MovingWindow(1.0, x)));
                bool crossed = Math.Abs(z) > boundary;
                bool practical = recent is { } r2 && r2.PerCoefficient[j] >= floor;
                findings.Add(new Finding
                {
                    Check = check,
                    Subject = layout.Terms[j],
                    Statistic = "moving_estimates",
                    Value = Finite(z),
                    PValue = Finite(pValue),
                    Limit = boundary,
                    Severity = crossed ? (practical ? Severity.Critical : Severity.Warning) : Severity.Ok,
                    EffectSize = Finite(me.Estimates[j] - b0[j]),
                    EffectSizeName = "coefficient_change",
                    RequiresPersistence = false,
                    Explanation = crossed
                        ? Fmt($"the coefficient of {layout.Terms[j]} has moved: {Num(me.Estimates[j])} on the window's {k} rows against {Num(b0[j])} deployed; the moving-estimates monitor at {Num(z)} crossed its boundary ±{Num(boundary)} ({P(pValue)} over the epoch); {CoefficientsCheck.Impact(recent, j, floor)}")
                        : Fmt($"moving estimate of {layout.Terms[j]}: {Num(me.Estimates[j])} against {Num(b0[j])} deployed, monitor {Num(z)} within ±{Num(boundary)} ({P(pValue)} over the epoch)"),
                    Details = Details(("estimate", me.Estimates[j]), ("baseline", b0[j]), ("critical_value", c), ("monitoring_time", x), ("window_fraction", k / n), ("epoch", state.Epoch)),
                });
            }

            double mosum = ResidualSumProcess.Value(input.Window.DeployedErrorSum, s, n);
            double mosumBoundary = MonitoringBoundary.MovingWindow(nullDistribution.StandardizedCriticalValue(levelAlpha) * spread, x);
            findings.Add(Level("ols_mosum", mosum, mosumBoundary, Math.Min(1.0, 2.0 * nullDistribution.PValue(Math.Abs(mosum) / spread / MonitoringBoundary.MovingWindow(1.0, x))), levelPractical, levelImpact, Fmt($"the window's {k} rows")));
        }
        else
        {
            findings.Add(Skip(check, "moving_estimates", SkipReasons.RankDeficient, "the window's design does not determine every coefficient, so the moving-estimates monitor cannot run"));
        }

        if (incrementUsable && state.CusumRows > 0)
        {
            double cusum = ResidualSumProcess.Value(HistoryErrorSum(baseline, b0) + state.CusumErrorSum, s, n);
            double cusumBoundary = MonitoringBoundary.Cusum(MonitoringBoundary.CusumCriticalValue(levelAlpha), 1.0 + (state.CusumRows / n));
            findings.Add(Level("ols_cusum", cusum, cusumBoundary, double.NaN, levelPractical, levelImpact, Fmt($"the {state.CusumRows} rows summed since the monitor (re)started")));
            if (Math.Abs(cusum) > cusumBoundary)
            {
                // A sum over every row since the start never forgets a shift that has ended; after a crossing it starts
                // again, so it crosses again only while the shift lasts.
                state = state with { CusumErrorSum = 0.0, CusumRows = 0 };
            }
        }

        return (findings, state);
    }

    /// <summary>
    /// The run-end design of the moving-window monitors: the window fraction rounded down to a grid of sixth powers of
    /// two (12 % apart, so a model's runs share one simulation), runs a window, runs an epoch. Rounding h down shrinks
    /// the history's share of the process and lengthens the epoch, both of which can only raise the critical value.
    /// </summary>
    public static MovingWindowDesign Design(CheckThresholds thresholds, double window)
    {
        int perWindow = Math.Max(1, (int)Math.Round(thresholds.WindowLength / thresholds.Cadence));
        double grid = Math.Pow(2.0, Math.Floor(6.0 * Math.Log2(window)) / 6.0);
        return new MovingWindowDesign(grid, perWindow, FalseAlarmBudget.EpochRuns(thresholds, grid, perWindow), OverlapsHistory: false);
    }

    private static Finding Level(string statistic, double value, double boundary, double pValue, bool practical, string impact, string rows)
    {
        bool crossed = Math.Abs(value) > boundary;
        string direction = value > 0 ? "above" : "below";
        string p = double.IsNaN(pValue) ? string.Empty : " (" + P(pValue) + " over the epoch)";
        return new Finding
        {
            Check = CheckNames.Coefficients,
            Statistic = statistic,
            Value = Finite(value),
            PValue = Finite(pValue),
            Limit = Finite(boundary),
            Severity = crossed ? (practical ? Severity.Critical : Severity.Warning) : Severity.Ok,
            EffectSize = Finite(value),
            EffectSizeName = "scaled_error_sum",
            RequiresPersistence = false,
            Explanation = crossed
                ? Fmt($"the level of the fit has moved: outcomes of {rows} run {direction} the deployed predictions; the {(statistic == "ols_mosum" ? "OLS-MOSUM" : "OLS-CUSUM")} monitor at {Num(value)} crossed ±{Num(boundary)}{p}; {impact}")
                : Fmt($"{(statistic == "ols_mosum" ? "OLS-MOSUM" : "OLS-CUSUM")} monitor of {rows}: {Num(value)} within ±{Num(boundary)}{p}"),
            Details = Details(("boundary", boundary)),
        };
    }

    /// <summary>The history's own residual sum (zero with an intercept); strucchange starts the OLS-CUSUM from it.</summary>
    private static double HistoryErrorSum(BaselineReference baseline, double[] b0)
    {
        if (baseline.Origin != BaselineOrigin.Fitted || baseline.OutcomeMean is not { } y || baseline.FeatureMeans.Count != baseline.Features.Count)
        {
            return 0.0;
        }

        int offset = baseline.Intercept ? 1 : 0;
        double predicted = offset == 1 ? b0[0] : 0.0;
        for (int j = 0; j < baseline.FeatureMeans.Count; j++)
        {
            predicted += b0[j + offset] * baseline.FeatureMeans[j];
        }

        return baseline.FactorRowCount * (y - predicted);
    }
}
