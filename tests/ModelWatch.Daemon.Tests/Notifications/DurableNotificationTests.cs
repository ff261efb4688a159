using System.Text.Json;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Notifications;

public sealed class DurableNotificationTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    private const string Secret = "loopback-receiver-shared-secret";

    [Fact]
    public async Task Transitions_recorded_while_no_dispatcher_runs_are_delivered_later_once_each_by_two_replicas()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.PrepareAsync(database, hours: 30);
        await DaemonTestData.RegisterAsync(database, time, "parcels-queued", notify: "[channel]");

        // Three subjects open critical alerts (a one-off check --record would write the same), then an engineer
        // acknowledges one; no dispatcher is running, as after a crash.
        DateTimeOffset slot = DaemonTestData.ReferenceEnd.AddHours(1);
        CheckResult result = new()
        {
            Check = CheckNames.Features,
            State = new CheckState(),
            Findings = [.. new[] { "distance_km", "stops", "load_kg" }.Select(f => new Finding { Check = CheckNames.Features, Subject = f, Statistic = "psi", Severity = Severity.Critical, RequiresPersistence = false, Value = 0.4, PValue = 1e-12, Alpha = 1.5e-6, Limit = 0.25, Explanation = "PSI of " + f })],
        };
        IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate([result], [], "fingerprint-1", new CheckThresholds());
        RecordedRun recorded = await DaemonTestData.RecordUnderLeaseAsync(database, "parcels-queued", slot, [result], decisions);
        var alerts = new AlertRepository(database.DataSource, DaemonTestData.CommandTimeout);
        Assert.Equal(AlertChangeKind.Changed, (await alerts.AcknowledgeAsync(recorded.Transitions[0].AlertId, "oncall@example.test", "on it", slot.AddMinutes(5), CancellationToken.None)).Kind);
        const string Pending = "SELECT count(*) FROM modelwatch.notification n JOIN modelwatch.alert a ON a.id = n.alert_id WHERE a.model_key = 'parcels-queued' AND n.state = 'pending'";
        Assert.Equal(4, await DaemonTestData.ScalarAsync(database.DataSource, Pending));

        // Two replicas come up and share the queue.
        using var channel = new LoopbackReceiver();
        var settings = new Dictionary<string, string?>
        {
            ["Notifications:Targets:channel:Url"] = channel.Url,
            ["Notifications:Targets:channel:Secret"] = Secret,
        };
        await using var first = new DaemonInstance(database, time, "replica-a", settings: settings);
        await using var second = new DaemonInstance(database, time, "replica-b", settings: settings);
        await Task.WhenAll(first.StartNotificationsAsync(), second.StartNotificationsAsync());
        await DaemonTestData.StepToAsync(time, time.GetUtcNow(), database.DataSource,
            "SELECT count(*) FROM modelwatch.notification n JOIN modelwatch.alert a ON a.id = n.alert_id WHERE a.model_key = 'parcels-queued' AND n.state = 'delivered'", 4);

        var bodies = channel.Received.ToList();
        Assert.Equal(4, bodies.Count);
        Assert.All(bodies, b => Assert.True(LoopbackReceiver.Verifies(b, Secret)));
        var events = bodies.Select(b => JsonDocument.Parse(b.Body).RootElement).ToList();
        Assert.Equal(4, events.Select(e => e.GetProperty("event_id").GetInt64()).Distinct().Count());
        Assert.Equal(3, events.Count(e => e.GetProperty("event").GetString() == "modelwatch.alert.opened"));
        Assert.Single(events, e => e.GetProperty("event").GetString() == "modelwatch.alert.acknowledged");

        // An opened alert carries its evidence's p-value, the alpha it was graded at and the PSI cut-off, as recorded.
        Assert.All(events.Where(e => e.GetProperty("event").GetString() == "modelwatch.alert.opened").Select(e => e.GetProperty("alert")), a =>
        {
            Assert.Equal(1e-12, a.GetProperty("p_value").GetDouble());
            Assert.Equal(1.5e-6, a.GetProperty("alpha").GetDouble());
            Assert.Equal(0.25, a.GetProperty("limit").GetDouble());
            Assert.Equal(1.5e-6, a.GetProperty("threshold").GetDouble());
        });
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, Pending));
        IReadOnlyList<AlertHistoryEntry> history = await alerts.HistoryAsync(recorded.Transitions[0].AlertId, CancellationToken.None);
        Assert.All(history, h => Assert.Equal(("channel", "delivered", 1), Assert.Single(h.Notifications) is var n ? (n.Target, n.State, n.Attempts) : default));
        Assert.Equal(4, await DaemonTestData.ScalarAsync(database.DataSource,
            "SELECT count(*) FROM modelwatch.notification_attempt t JOIN modelwatch.alert a ON a.id = t.alert_id WHERE a.model_key = 'parcels-queued' AND t.alert_event IS NOT NULL AND t.error IS NULL"));
    }
}
