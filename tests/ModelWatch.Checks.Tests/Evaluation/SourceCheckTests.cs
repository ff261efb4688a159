using ModelWatch.Calibration;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Source;
using ModelWatch.Checks.Summaries;

namespace ModelWatch.Checks.Tests.Evaluation;

/// <summary>
/// The <c>source</c> check: failed runs in a row (3 by default, common practice), an optional time limit on a series of
/// failures, and the staleness of the newest row; through the alert policy, an alert that opens at once and resolves
/// on the first run that reads its window.
/// </summary>
public sealed class SourceCheckTests
{
    private static readonly DateTimeOffset Start = new(2026, 3, 1, 0, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Three_failures_in_a_row_open_a_critical_alert_that_names_the_model_and_the_last_error_and_one_good_run_resolves_it()
    {
        var thresholds = new CheckThresholds();
        CheckState? state = null;
        List<AlertPolicyState> policy = [];
        var actions = new List<AlertAction>();
        var severities = new List<Severity>();
        Finding? last = null;
        string[] errors = ["division by zero", "password authentication failed for user \"reader\"", "relation \"orders\" does not exist"];
        for (int run = 0; run < 3; run++)
        {
            CheckResult result = SourceCheck.Failed("shop-basket", state, "b1", errors[run], Start.AddHours(run), thresholds);
            (state, policy, AlertDecision decision) = Decide(result, policy, thresholds);
            actions.Add(decision.Action);
            last = result.Findings.Single();
            severities.Add(last.Severity);
        }

        Assert.Equal([Severity.Warning, Severity.Warning, Severity.Critical], severities);
        Assert.Equal([AlertAction.None, AlertAction.None, AlertAction.Open], actions);
        Assert.False(last!.RequiresPersistence);
        Assert.Equal("failed_runs", last.Statistic);
        Assert.Equal(3.0, last.Value);
        Assert.Equal("3 runs in a row failed since 2026-03-01T00:00:00Z; model shop-basket is not being watched (alert at 3 failed runs); last error: relation \"orders\" does not exist", last.Explanation);

        // The first run that reads its window clears the count and resolves the alert at once (no hysteresis for a fault).
        var model = new SyntheticModel(seed: 7, features: 2);
        BaselineReference baseline = model.Baseline(300);
        CheckResult ok = SourceCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = model.Window(baseline, 50), WindowStart = Start.AddHours(2), WindowEnd = Start.AddHours(3), State = state, Thresholds = thresholds, NewestRowTime = Start.AddHours(3).AddMinutes(-4) });
        (_, _, AlertDecision resolved) = Decide(ok, policy, thresholds);
        Assert.Equal(Severity.Ok, ok.Findings.Single().Severity);
        Assert.Equal("the run read its window: 0 failed runs in a row (alert at 3); it read its window again after 3 failed run(s)", ok.Findings.Single().Explanation);
        Assert.Equal(AlertAction.Resolve, resolved.Action);
        Assert.Equal(0, SourceCheck.Recall(ok.State).ConsecutiveFailures);
        Assert.Equal(4.0 / 60, ok.Findings.Single().Details["data_age_hours"], 12);
    }

    [Fact]
    public void A_time_limit_opens_the_alert_before_the_count_and_the_count_is_a_setting()
    {
        CheckThresholds hours = new CheckThresholds().With(SourceCheck.MaxFailingHours, 6).With(SourceCheck.MaxFailedRuns, 10);
        CheckResult first = SourceCheck.Failed("slow-feed", null, "b1", "timeout", Start, hours);
        CheckResult second = SourceCheck.Failed("slow-feed", first.State, "b1", "timeout", Start.AddHours(5), hours);
        CheckResult third = SourceCheck.Failed("slow-feed", second.State, "b1", "timeout", Start.AddHours(6), hours);

        Assert.Equal(Severity.Warning, second.Findings.Single().Severity);
        Assert.Equal("2 runs in a row failed since 2026-03-01T00:00:00Z; alert at 10 failed runs or 6 h; last error: timeout", second.Findings.Single().Explanation);
        Assert.Equal(Severity.Critical, third.Findings.Single().Severity);
        Assert.Equal(6.0, third.Findings.Single().Details["failing_hours"]);

        CheckThresholds one = new CheckThresholds().With(SourceCheck.MaxFailedRuns, 1);
        Assert.Equal(Severity.Critical, SourceCheck.Failed("strict", null, "b1", "x", Start, one).Findings.Single().Severity);
    }

    [Fact]
    public void A_source_that_answers_but_stopped_filling_is_critical_past_the_staleness_limit_measured_at_the_windows_end()
    {
        var model = new SyntheticModel(seed: 8, features: 2);
        BaselineReference baseline = model.Baseline(300);
        CheckThresholds stale = new CheckThresholds().With(SourceCheck.MaxDataAgeHours, 24);

        // The newest row seen stays in the state: a window with no rows at all still knows how old the data is.
        CheckResult seen = SourceCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = model.Window(baseline, 40), WindowStart = Start, WindowEnd = Start.AddHours(6), Thresholds = stale, NewestRowTime = Start.AddHours(5) });
        CheckResult empty = SourceCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = model.Window(baseline, 0), WindowStart = Start.AddHours(24), WindowEnd = Start.AddHours(30), State = seen.State, Thresholds = stale });

        Assert.Equal(Severity.Ok, seen.Findings.Single().Severity);
        Finding old = empty.Findings.Single();
        Assert.Equal(Severity.Critical, old.Severity);
        Assert.Equal("data_age_hours", old.Statistic);
        Assert.Equal(25.0, old.Value);
        Assert.Equal(24.0, old.Threshold);
        Assert.False(old.RequiresPersistence);

        // Off by default: the same data age is only reported.
        CheckResult quiet = SourceCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = model.Window(baseline, 0), WindowStart = Start.AddHours(24), WindowEnd = Start.AddHours(30), State = seen.State });
        Assert.Equal(Severity.Ok, quiet.Findings.Single().Severity);
        Assert.Equal(25.0, quiet.Findings.Single().Details["data_age_hours"]);
    }

    [Fact]
    public void The_source_check_runs_first_and_is_never_skipped_for_want_of_rows()
    {
        var model = new SyntheticModel(seed: 9, features: 2);
        BaselineReference baseline = model.Baseline(300);

        IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, model.Window(baseline, 3), Start, Start.AddHours(1), null, newestRowTime: Start.AddMinutes(30));

        Assert.Equal(CheckNames.Source, results[0].Check);
        Assert.False(results[0].Skipped);
        Assert.True(results.Single(r => r.Check == CheckNames.Data).Skipped);
        Assert.Equal(0.5, results[0].Findings.Single().Details["data_age_hours"]);
    }

    private static (CheckState State, List<AlertPolicyState> Policy, AlertDecision Decision) Decide(CheckResult result, List<AlertPolicyState> policy, CheckThresholds thresholds)
    {
        AlertDecision decision = AlertPolicy.Evaluate([result], policy, "b1", thresholds).Single();
        return (result.State, [decision.State], decision);
    }
}
