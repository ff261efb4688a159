using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Checks.Tests.Policy;

public sealed class AlertPolicyTests
{
    private static readonly CheckThresholds Thresholds = new();

    private static CheckResult Run(string check, Severity severity, bool persistent = true, bool skipped = false, string? subject = null) => new()
    {
        Check = check,
        State = new CheckState(),
        Findings = [new Finding { Check = check, Subject = subject, Statistic = "s", Severity = severity, RequiresPersistence = persistent, Skipped = skipped, Explanation = "x" }],
    };

    private static List<AlertAction> Replay(IEnumerable<CheckResult> runs, string fingerprint = "b1")
    {
        var states = new List<AlertPolicyState>();
        var actions = new List<AlertAction>();
        foreach (CheckResult run in runs)
        {
            IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate([run], states, fingerprint, Thresholds);
            actions.Add(decisions.Single(d => d.Check == run.Check).Action);
            states = decisions.Select(d => d.State).ToList();
        }

        return actions;
    }

    [Fact]
    public void One_critical_window_does_not_open_but_two_of_three_do()
    {
        List<AlertAction> actions = Replay([Run("error", Severity.Critical), Run("error", Severity.Ok), Run("error", Severity.Critical)]);
        Assert.Equal([AlertAction.None, AlertAction.None, AlertAction.Open], actions);
        Assert.Equal([AlertAction.None, AlertAction.None, AlertAction.None, AlertAction.None], Replay([Run("error", Severity.Critical), Run("error", Severity.Ok), Run("error", Severity.Ok), Run("error", Severity.Critical)]));
    }

    [Fact]
    public void Sequential_evidence_opens_at_once()
    {
        Assert.Equal([AlertAction.Open], Replay([Run("residuals", Severity.Critical, persistent: false)]));
    }

    [Fact]
    public void An_open_alert_resolves_only_after_enough_ok_runs_and_a_warning_holds_it()
    {
        List<AlertAction> actions = Replay(
        [
            Run("features", Severity.Critical, subject: "x1"), Run("features", Severity.Critical, subject: "x1"),
            Run("features", Severity.Critical, subject: "x1"), Run("features", Severity.Ok, subject: "x1"),
            Run("features", Severity.Warning, subject: "x1"), Run("features", Severity.Ok, subject: "x1"),
            Run("features", Severity.Ok, subject: "x1"), Run("features", Severity.Ok, subject: "x1"),
        ]);
        Assert.Equal([AlertAction.None, AlertAction.Open, AlertAction.Raise, AlertAction.None, AlertAction.None, AlertAction.None, AlertAction.None, AlertAction.Resolve], actions);
    }

    [Fact]
    public void Skipped_findings_leave_the_history_untouched()
    {
        List<AlertAction> actions = Replay([Run("error", Severity.Critical), Run("error", Severity.Ok, skipped: true), Run("error", Severity.Ok, skipped: true), Run("error", Severity.Critical)]);
        Assert.Equal([AlertAction.None, AlertAction.None, AlertAction.None, AlertAction.Open], actions);
    }

    [Fact]
    public void A_new_baseline_clears_the_persistence_history()
    {
        IReadOnlyList<AlertDecision> first = AlertPolicy.Evaluate([Run("error", Severity.Critical)], [], "b1", Thresholds);
        IReadOnlyList<AlertDecision> second = AlertPolicy.Evaluate([Run("error", Severity.Critical)], first.Select(d => d.State), "b2", Thresholds);
        Assert.Equal(AlertAction.None, second.Single().Action);
        Assert.Single(second.Single().State.Recent);
    }

    [Fact]
    public void Budget_splits_one_false_alarm_a_year_over_the_channels()
    {
        // methods.md §3.5.1 [D]: hourly tests with K = 10 give α ≈ 1.1e-5; daily windows give α ≈ 2.7e-4.
        Assert.Equal(1.14e-5, FalseAlarmBudget.FixedSampleAlpha(new CheckThresholds { AlarmChannels = 10, WindowLength = TimeSpan.FromHours(1) }), 7);
        Assert.Equal(2.74e-4, FalseAlarmBudget.FixedSampleAlpha(new CheckThresholds { AlarmChannels = 10 }), 6);

        // A CUSUM's share at hourly runs (ARL0 = 11 × 8,766 runs) needs h above the one-year 7.921 of methods.md §3.4.
        Assert.InRange(FalseAlarmBudget.CusumThreshold(new CheckThresholds()), 9.5, 11.0);
        Assert.Equal(7.921, FalseAlarmBudget.CusumThreshold(new CheckThresholds { AlarmChannels = 1 }), 2);
    }
}
