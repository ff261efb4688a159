using ModelWatch.Calibration;
using ModelWatch.Checks.Coefficients;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Features;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Residuals;
using ModelWatch.Checks.Summaries;

namespace ModelWatch.Checks.Tests.Evaluation;

/// <summary>What every run's evidence does on rolling windows, scenario by scenario (invented data, fixed seeds).</summary>
public sealed class RollingEvidenceTests
{
    private static readonly CalibrationSetup Setup = new(RowsPerHour: 20);

    [Fact]
    public void A_slope_change_is_named_by_its_moving_estimates_component_on_the_first_run_that_sees_it()
    {
        (SyntheticModel model, BaselineReference baseline) = Setup.Trial(901, 0);
        var monitor = new RollingMonitor(model, baseline, Cadence.Ratio7, Setup.RowsPerHour);
        for (int run = 0; run < 8; run++)
        {
            Assert.DoesNotContain(monitor.Run().Results.SelectMany(r => r.Findings), f => f.Severity == Severity.Critical);
        }

        model.Change = Scenario.Coefficient.Change;
        IReadOnlyList<CheckResult> results = monitor.Run().Results;
        Finding[] me = [.. results.Single(r => r.Check == CheckNames.Coefficients).Findings.Where(f => f.Statistic == "moving_estimates")];

        // One component per slope, none for the intercept; only x3's crosses its boundary.
        Assert.Equal(["x1", "x2", "x3", "x4", "x5"], me.Select(f => f.Subject));
        Finding x3 = me.Single(f => f.Subject == "x3");
        Assert.Equal(Severity.Critical, x3.Severity);
        Assert.False(x3.RequiresPersistence);
        Assert.True(Math.Abs(x3.Value!.Value) > x3.Threshold!.Value);
        Assert.All(me.Where(f => f.Subject != "x3"), f => Assert.True(Math.Abs(f.Value!.Value) <= f.Threshold!.Value));
    }

    [Fact]
    public void A_shift_that_ends_is_not_mistaken_for_a_new_shift_the_other_way()
    {
        (SyntheticModel model, BaselineReference baseline) = Setup.Trial(902, 0);
        var monitor = new RollingMonitor(model, baseline, Cadence.Ratio1, Setup.RowsPerHour * 5);
        model.Change = new Shift { Bias = 0.6 };
        bool opened = false;
        for (int run = 0; run < 30; run++)
        {
            opened |= monitor.Run().Decisions.Any(d => d.Action == AlertAction.Open && d.Check == CheckNames.Residuals);
        }

        Assert.True(opened);

        // Back to normal: the shift's rows stayed out of the running fit, so the CUSUM falls back and the alert resolves.
        model.Change = Shift.None;
        var afterwards = new List<AlertDecision>();
        for (int run = 0; run < 60; run++)
        {
            afterwards.AddRange(monitor.Run().Decisions.Where(d => d.Check == CheckNames.Residuals));
        }

        Assert.Contains(afterwards, d => d.Action == AlertAction.Resolve);
        Assert.DoesNotContain(afterwards, d => d.Action == AlertAction.Open);
    }

    [Fact]
    public void A_new_near_dependency_in_the_new_rows_opens_at_once_while_the_week_long_window_still_dilutes_it()
    {
        (SyntheticModel model, BaselineReference baseline) = Setup.Trial(903, 0);
        var monitor = new RollingMonitor(model, baseline, Cadence.Ratio7, Setup.RowsPerHour);
        monitor.Run();
        model.Change = Scenario.Collinear.Change;
        (IReadOnlyList<CheckResult> results, IReadOnlyList<AlertDecision> decisions) = monitor.Run();
        Finding[] collinearity = [.. results.Single(r => r.Check == CheckNames.Collinearity).Findings];

        Finding fresh = collinearity.Single(f => f.Statistic == "vif_new_rows" && f.Subject == "x2");
        Assert.Equal(Severity.Critical, fresh.Severity);
        Assert.True(fresh.Value > 10);
        Assert.NotEqual(Severity.Critical, collinearity.Single(f => f.Statistic == "vif" && f.Subject == "x2").Severity);
        Assert.Contains(decisions, d => d.Action == AlertAction.Open && d.Check == CheckNames.Collinearity && d.Subject == "x2");
    }

    [Fact]
    public void A_thin_window_with_an_empty_decile_is_not_a_drift()
    {
        // 60 rows in ten deciles leave a bin empty once in a few hundred runs; PSI's floored logarithm then adds 0.69.
        (SyntheticModel model, BaselineReference baseline) = Setup.Trial(904, 0);
        var thresholds = new CheckThresholds { Cadence = TimeSpan.FromHours(1), WindowLength = TimeSpan.FromHours(1) };
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        double low = baseline.FeatureBins[0].Edges[0];
        for (int added = 0; added < 60;)
        {
            (double[] x, double y) = model.Row();
            if (x[0] > low)
            {
                builder.AddRow(x, y);
                added++;
            }
        }

        var input = new CheckInput { Baseline = baseline, Window = builder.Build(), WindowStart = RollingMonitor.Origin, WindowEnd = RollingMonitor.Origin.AddHours(1), Thresholds = thresholds };
        Finding psi = FeaturesCheck.Instance.Run(input).Findings.Single(f => f.Statistic == "psi" && f.Subject == "x1");
        Assert.True(psi.Value > 0.25, "the empty bin alone lifts PSI over the cut-off");
        Assert.NotEqual(Severity.Critical, psi.Severity);
    }

    [Fact]
    public void The_OLS_CUSUM_restarts_after_a_crossing_so_an_ended_level_shift_stops_counting()
    {
        (SyntheticModel model, BaselineReference baseline) = Setup.Trial(905, 0);
        var monitor = new RollingMonitor(model, baseline, Cadence.Ratio24, Setup.RowsPerHour);
        model.Change = new Shift { Bias = 1.0 };
        bool crossed = false;
        for (int run = 0; run < 12 && !crossed; run++)
        {
            crossed = monitor.Run().Results.Single(r => r.Check == CheckNames.Coefficients).Findings.Any(f => f.Statistic == "ols_cusum" && Math.Abs(f.Value!.Value) > f.Threshold!.Value);
        }

        Assert.True(crossed);
        model.Change = Shift.None;
        Finding? last = null;
        for (int run = 0; run < 48; run++)
        {
            last = monitor.Run().Results.Single(r => r.Check == CheckNames.Coefficients).Findings.SingleOrDefault(f => f.Statistic == "ols_cusum");
        }

        Assert.NotNull(last);
        Assert.True(Math.Abs(last.Value!.Value) < last.Threshold!.Value);
    }

    [Fact]
    public void New_rows_too_few_for_their_own_estimate_wait_for_the_next_run()
    {
        (SyntheticModel model, BaselineReference baseline) = Setup.Trial(906, 0);
        var monitor = new RollingMonitor(model, baseline, Cadence.Ratio24, rowsPerHour: 3);
        Finding[] first = [.. monitor.Run().Results.Single(r => r.Check == CheckNames.Coefficients).Findings.Where(f => f.Statistic == "cusum")];
        Finding[] second = [.. monitor.Run().Results.Single(r => r.Check == CheckNames.Coefficients).Findings.Where(f => f.Statistic == "cusum")];
        Finding[] third = [.. monitor.Run().Results.Single(r => r.Check == CheckNames.Coefficients).Findings.Where(f => f.Statistic == "cusum")];

        // Three rows an hour and six coefficients: the first block steps the CUSUMs on the third run, with nine rows.
        Assert.Empty(first);
        Assert.Empty(second);
        Assert.Equal(5, third.Length);
        Assert.All(third, f => Assert.Equal(9, f.Details["new_rows"]));
    }
}
