using Microsoft.Extensions.Time.Testing;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Alerts;

public sealed class WarningAlertTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task A_warning_alert_is_stored_as_warning_and_escalates_once_on_critical_evidence()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.PrepareAsync(database, hours: 30);
        await DaemonTestData.RegisterAsync(database, time, "parcels-warned");
        var thresholds = new CheckThresholds { WarningAlerts = true };
        List<AlertPolicyState> states = [];
        var transitions = new List<AlertEvent>();

        // Per-window residual tests: warning, warning (a warning alert opens), critical (alone: no escalation),
        // critical (two of the last three: escalates).
        Severity[] windows = [Severity.Warning, Severity.Warning, Severity.Critical, Severity.Critical];
        for (int i = 0; i < windows.Length; i++)
        {
            DateTimeOffset slot = DaemonTestData.ReferenceEnd.AddHours(i + 1);
            CheckResult result = new()
            {
                Check = CheckNames.Residuals,
                State = new CheckState(),
                Findings = [new Finding { Check = CheckNames.Residuals, Statistic = "brown_forsythe", Severity = windows[i], Value = 4.2 + i, Alpha = 0.01, Explanation = $"window {i + 1}" }],
            };
            IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate([result], states, "fingerprint-1", thresholds);
            states = [.. decisions.Select(d => d.State)];
            RecordedRun recorded = await DaemonTestData.RecordUnderLeaseAsync(database, "parcels-warned", slot, [result], decisions);
            transitions.AddRange(recorded.Transitions);
        }

        Assert.Equal([("opened", "warning"), ("escalated", "critical")], transitions.Select(t => (t.Transition, t.Severity)));
        var alerts = new AlertRepository(database.DataSource, DaemonTestData.CommandTimeout);
        AlertView alert = Assert.Single(await alerts.ListAsync("parcels-warned", "unresolved", 10, CancellationToken.None));
        Assert.Equal("critical", alert.Severity);
        Assert.Equal(["opened", "escalated"], (await alerts.HistoryAsync(alert.Id, CancellationToken.None)).Select(h => h.Transition));
    }
}
