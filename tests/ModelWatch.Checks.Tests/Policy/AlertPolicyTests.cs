using ModelWatch.Checks.Evaluation;
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

    private static List<AlertAction> Replay(IEnumerable<CheckResult> runs, string fingerprint = "b1") =>
        [.. Decide(runs, Thresholds, fingerprint).Select(d => d.Action)];

    private static List<AlertDecision> Decide(IEnumerable<CheckResult> runs, CheckThresholds thresholds, string fingerprint = "b1")
    {
        var states = new List<AlertPolicyState>();
        var made = new List<AlertDecision>();
        foreach (CheckResult run in runs)
        {
            IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate([run], states, fingerprint, thresholds);
            made.Add(decisions.Single(d => d.Check == run.Check));
            states = decisions.Select(d => d.State).ToList();
        }

        return made;
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
    public void Warnings_open_nothing_unless_warning_alerts_are_on()
    {
        CheckResult[] runs = [Run("residuals", Severity.Warning), Run("residuals", Severity.Ok), Run("residuals", Severity.Warning)];
        Assert.All(Replay(runs), a => Assert.Equal(AlertAction.None, a));

        List<AlertDecision> decisions = Decide(runs, new CheckThresholds { WarningAlerts = true });
        Assert.Equal([AlertAction.None, AlertAction.None, AlertAction.Open], decisions.Select(d => d.Action));
        Assert.Equal(Severity.Warning, decisions[2].EffectiveSeverity);
    }

    [Fact]
    public void A_warning_alert_escalates_only_under_the_critical_rule()
    {
        var thresholds = new CheckThresholds { WarningAlerts = true };
        List<AlertDecision> decisions = Decide(
        [
            Run("error", Severity.Warning), Run("error", Severity.Warning), Run("error", Severity.Critical),
            Run("error", Severity.Critical), Run("error", Severity.Ok), Run("error", Severity.Ok), Run("error", Severity.Ok),
        ], thresholds);

        // Window 2 opens a warning alert; window 3's lone critical refreshes it without escalating; window 4 makes two
        // critical of the last three, which escalates; three ok windows then resolve it.
        Assert.Equal([AlertAction.None, AlertAction.Open, AlertAction.Raise, AlertAction.Raise, AlertAction.None, AlertAction.None, AlertAction.Resolve], decisions.Select(d => d.Action));
        Assert.Equal([Severity.Warning, Severity.Warning, Severity.Critical], decisions.Skip(1).Take(3).Select(d => d.EffectiveSeverity));

        // Sequential (immediate) critical evidence escalates at once; immediate warnings alone never open an alert.
        Assert.Equal(Severity.Critical, Decide([Run("residuals", Severity.Critical, persistent: false)], thresholds).Single().EffectiveSeverity);
        Assert.All(Decide([Run("residuals", Severity.Warning, persistent: false), Run("residuals", Severity.Warning, persistent: false)], thresholds), d => Assert.Equal(AlertAction.None, d.Action));
    }

    [Fact]
    public void Without_warning_alerts_every_alert_is_critical()
    {
        List<AlertDecision> decisions = Decide([Run("error", Severity.Critical), Run("error", Severity.Critical), Run("error", Severity.Critical)], Thresholds);
        Assert.Equal([AlertAction.None, AlertAction.Open, AlertAction.Raise], decisions.Select(d => d.Action));
        Assert.All(decisions.Skip(1), d => Assert.Equal(Severity.Critical, d.EffectiveSeverity));
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
    public void Budget_splits_one_false_alarm_a_year_over_the_channels_and_the_runs()
    {
        // Bonferroni over the runs of a year, F*/(K·N_runs): hourly runs with K = 10 give α ≈ 1.14e-5, daily runs 2.74e-4,
        // whatever the window each run reads.
        Assert.Equal(1.14e-5, FalseAlarmBudget.RunAlpha(new CheckThresholds { AlarmChannels = 10, WindowLength = TimeSpan.FromDays(7) }), 7);
        Assert.Equal(2.74e-4, FalseAlarmBudget.RunAlpha(new CheckThresholds { AlarmChannels = 10, Cadence = TimeSpan.FromDays(1), WindowLength = TimeSpan.FromDays(7) }), 6);
        Assert.Equal(FalseAlarmBudget.RunAlpha(new CheckThresholds()) / 4.0, FalseAlarmBudget.RunAlpha(new CheckThresholds(), tests: 4), 15);

        // Every registered channel counts, and tests sharing one split it.
        Assert.Equal(CheckRegistry.Channels.Count, FalseAlarmBudget.Channels(new CheckThresholds()));
        Assert.Equal(19, CheckRegistry.Channels.Count);

        // One channel at hourly runs: ARL0 = 8,766 runs needs h = 7.921 (k = 0.5, two-sided; spc::xcusum.crit, see
        // PageCusumTests). The default share (K = 19) needs more.
        Assert.Equal(7.921, FalseAlarmBudget.CusumThreshold(new CheckThresholds { AlarmChannels = 1 }), 2);
        Assert.InRange(FalseAlarmBudget.CusumThreshold(new CheckThresholds()), 10.5, 12.0);
        Assert.True(FalseAlarmBudget.CusumThreshold(new CheckThresholds(), oneSided: true) < FalseAlarmBudget.CusumThreshold(new CheckThresholds()));

        // A monitor's epoch lasts until e − 1 history lengths of new rows have come: a 7-day window read daily on a 30-day
        // baseline (h = 7/30, 7 runs a window) gives 52 daily runs; at most a year of runs; its size is the channel's
        // yearly share times the epoch's part of the year.
        var daily = new CheckThresholds { Cadence = TimeSpan.FromDays(1) };
        Assert.Equal(52, FalseAlarmBudget.EpochRuns(daily, 7.0 / 30.0, 7));
        Assert.Equal(365, FalseAlarmBudget.EpochRuns(daily, 0.001, 1));
        Assert.Equal(52 / FalseAlarmBudget.RunsPerYear(daily) / 19, FalseAlarmBudget.EpochAlpha(daily, 52), 12);
        Assert.Equal(1.0 / 19 / 5, FalseAlarmBudget.EpochAlpha(daily, 400, monitors: 5), 12);
    }
}
