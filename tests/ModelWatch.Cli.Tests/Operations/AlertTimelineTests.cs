using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Cli.Operations;
using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Tests.Operations;

/// <summary>The backtest's in-memory alert timeline and slot list: pure, no database.</summary>
public sealed class AlertTimelineTests
{
    private static readonly DateTimeOffset T0 = new(2026, 2, 2, 0, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Open_escalate_resolve_and_reopen_follow_the_recorded_lifecycle()
    {
        var timeline = new AlertTimeline();

        timeline.Apply(T0, [Decision("residuals", null, AlertAction.Open, Severity.Warning), Decision("coefficients", "load_kg", AlertAction.None, Severity.Critical)]);
        timeline.Apply(T0.AddHours(1), [Decision("residuals", null, AlertAction.Raise, Severity.Critical)]);
        timeline.Apply(T0.AddHours(2), [Decision("residuals", null, AlertAction.Resolve, Severity.Ok), Decision("coefficients", "load_kg", AlertAction.Open, Severity.Critical)]);
        timeline.Apply(T0.AddHours(3), [Decision("residuals", null, AlertAction.Resolve, Severity.Ok)]);
        timeline.Apply(T0.AddHours(4), [Decision("residuals", null, AlertAction.Raise, Severity.Critical)]);

        Assert.Equal(
            [
                new TimelineAlert("residuals", null, Severity.Critical, T0, T0.AddHours(2)),
                new TimelineAlert("coefficients", "load_kg", Severity.Critical, T0.AddHours(2), null),
                new TimelineAlert("residuals", null, Severity.Critical, T0.AddHours(4), null),
            ],
            timeline.Alerts);
    }

    [Fact]
    public void Schedule_slots_are_the_schedules_own_and_every_steps_from_the_start()
    {
        Assert.True(Schedule.TryParse("0 6 * * 1-5", out Schedule? weekdays, out _));
        Assert.True(Schedule.TryParse("1h", out Schedule? hourly, out _));
        Assert.True(Duration.TryParse("90m", out Duration step, out _));
        DateTimeOffset monday = new(2026, 2, 2, 0, 0, 0, TimeSpan.Zero);

        IReadOnlyList<DateTimeOffset> cron = BacktestSlots.Between("m", weekdays!, monday, monday.AddDays(7), null);
        IReadOnlyList<DateTimeOffset> interval = BacktestSlots.Between("m", hourly!, monday.AddMinutes(30), monday.AddHours(3), null);
        IReadOnlyList<DateTimeOffset> every = BacktestSlots.Between("m", hourly!, monday.AddMinutes(30), monday.AddHours(3), step);

        Assert.Equal([.. Enumerable.Range(0, 5).Select(d => monday.AddDays(d).AddHours(6))], cron);
        Assert.Equal([monday.AddHours(1), monday.AddHours(2), monday.AddHours(3)], interval);
        Assert.Equal([monday.AddMinutes(30), monday.AddMinutes(120)], every);
    }

    [Fact]
    public void Too_many_windows_is_an_error_that_asks_for_a_longer_step()
    {
        Assert.True(Schedule.TryParse("1m", out Schedule? minutely, out _));

        var error = Assert.Throws<OperationException>(() => BacktestSlots.Between("busy", minutely!, T0, T0.AddDays(60), null));

        Assert.Contains("model busy: more than 50000 windows", error.Message, StringComparison.Ordinal);
    }

    private static AlertDecision Decision(string check, string? subject, AlertAction action, Severity severity) => new()
    {
        Check = check,
        Subject = subject,
        Action = action,
        Evidence = new Finding { Check = check, Subject = subject, Statistic = "test", Severity = severity, Explanation = "invented" },
        Reason = "invented",
        State = new AlertPolicyState { Check = check, Subject = subject },
    };
}
