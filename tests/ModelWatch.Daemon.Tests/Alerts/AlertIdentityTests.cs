using Microsoft.Extensions.Time.Testing;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Alerts;

/// <summary>
/// Alert numbers and predecessors as the recorder writes them: alerts draw from their own sequence (runs in between
/// do not make them jump), and a condition that returns after resolution opens a new alert naming the one before,
/// in the database, in the webhook body and in the log record.
/// </summary>
public sealed class AlertIdentityTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task A_returning_condition_opens_the_next_alert_number_and_names_its_predecessor_everywhere()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.PrepareAsync(database, hours: 30);
        await DaemonTestData.RegisterAsync(database, time, "parcels-identity", notify: "[channel]");
        DateTimeOffset slot = DaemonTestData.ReferenceEnd;

        RecordedRun first = await RecordAsync(slot = slot.AddHours(1), AlertAction.Open, Severity.Critical);
        RecordedRun quiet1 = await RecordAsync(slot = slot.AddHours(1), AlertAction.None, Severity.Ok);
        RecordedRun resolved = await RecordAsync(slot = slot.AddHours(1), AlertAction.Resolve, Severity.Ok);
        RecordedRun quiet2 = await RecordAsync(slot = slot.AddHours(1), AlertAction.None, Severity.Ok);
        RecordedRun again = await RecordAsync(slot.AddHours(1), AlertAction.Open, Severity.Critical);

        AlertEvent opened = Assert.Single(first.Transitions);
        AlertEvent reopened = Assert.Single(again.Transitions);
        Assert.Equal("resolved", Assert.Single(resolved.Transitions).Transition);
        Assert.Empty(quiet1.Transitions.Concat(quiet2.Transitions));

        // Four runs were recorded between the two alerts; the alert numbers still follow each other.
        Assert.True(again.RunId - first.RunId >= 4);
        Assert.Equal(opened.AlertId + 1, reopened.AlertId);
        Assert.Equal("opened", reopened.Transition);
        Assert.Null(opened.PreviousAlertId);
        Assert.Equal(opened.AlertId, reopened.PreviousAlertId);

        var alerts = new AlertRepository(database.DataSource, DaemonTestData.CommandTimeout);
        AlertView view = (await alerts.GetAsync(reopened.AlertId, CancellationToken.None))!;
        Assert.Equal(opened.AlertId, view.PreviousAlertId);
        Assert.Equal("critical", view.OpeningSeverity);
        Assert.Equal(1e-4, view.OpeningAlpha);
        Assert.Equal(1e-9, view.OpeningPValue);
        Assert.Equal(["opened"], (await alerts.HistoryAsync(reopened.AlertId, CancellationToken.None)).Select(h => h.Transition));

        // The old alert keeps its own history: opened, then resolved; it is never rewritten.
        Assert.Equal(["opened", "resolved"], (await alerts.HistoryAsync(opened.AlertId, CancellationToken.None)).Select(h => h.Transition));
        AlertView old = (await alerts.GetAsync(opened.AlertId, CancellationToken.None))!;
        Assert.Equal("critical", old.OpeningSeverity);
        Assert.Equal("ok", old.LatestSeverity);
        Assert.Equal("daemon:test-recorder", old.ResolvedBy);

        string body = System.Text.Encoding.UTF8.GetString(NotificationPayload.Create(reopened, slot));
        Assert.Contains($"\"previous_alert\":{opened.AlertId}", body, StringComparison.Ordinal);
    }

    private Task<RecordedRun> RecordAsync(DateTimeOffset slot, AlertAction action, Severity severity)
    {
        Finding finding = new()
        {
            Check = CheckNames.Coefficients,
            Statistic = "wald",
            Value = severity == Severity.Critical ? 48.2 : 1.1,
            PValue = severity == Severity.Critical ? 1e-9 : 0.58,
            Alpha = 1e-4,
            Severity = severity,
            RequiresPersistence = false,
            Explanation = severity == Severity.Critical ? "coefficients moved" : "coefficients as at baseline",
        };
        CheckResult result = new() { Check = CheckNames.Coefficients, State = new CheckState(), Findings = [finding] };
        AlertDecision decision = new()
        {
            Check = CheckNames.Coefficients,
            Action = action,
            Evidence = finding,
            Reason = action.ToString(),
            State = new AlertPolicyState { Check = CheckNames.Coefficients },
        };
        return DaemonTestData.RecordUnderLeaseAsync(database, "parcels-identity", slot, [result], [decision]);
    }
}
