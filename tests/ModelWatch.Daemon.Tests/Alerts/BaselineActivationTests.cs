using Microsoft.Extensions.Time.Testing;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Alerts;

public sealed class BaselineActivationTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task The_daemon_watches_an_activated_older_version_not_the_newest()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.PrepareAsync(database, hours: 28);
        await DaemonTestData.RegisterAsync(database, time, "parcels-pinned");
        await using (StoreDataSources databases = DaemonTestData.DataSources(database.ConnectionString))
        {
            StoredBaseline second = await new BaselineService(databases, time, DaemonTestData.CommandTimeout)
                .FitAsync("parcels-pinned", DaemonTestData.Start, DaemonTestData.Start.AddHours(12), "test", CancellationToken.None);
            Assert.Equal(2, second.Version);
        }

        var activation = new BaselineActivation(database.DataSource, time, DaemonTestData.CommandTimeout);
        ActivationOutcome outcome = await activation.ActivateAsync("parcels-pinned", 1, "oncall@example.test", keepAlerts: false, CancellationToken.None);
        StoredBaseline? current = await new BaselineRepository(database.DataSource, time, DaemonTestData.CommandTimeout).GetCurrentAsync("parcels-pinned", CancellationToken.None);

        await using (var daemon = new DaemonInstance(database, time, "replica-pinned"))
        {
            await daemon.StartAsync();
            for (int hour = 1; hour <= 2; hour++)
            {
                await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), database.DataSource,
                    "SELECT count(*) FROM modelwatch.run WHERE model_key = 'parcels-pinned' AND status <> 'running'", hour);
            }

            await daemon.StopAsync();
        }

        Assert.Equal((1, (int?)2), (outcome.Version, outcome.PreviousVersion));
        Assert.Equal(1, current!.Version);
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'parcels-pinned' AND baseline_version IS DISTINCT FROM 1"));
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'parcels-pinned' AND status <> 'ok'"));
    }

    [Fact]
    public async Task Storing_a_new_baseline_supersedes_an_alert_a_recorded_run_opened_and_queues_its_notification()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.PrepareAsync(database, hours: 28);
        await DaemonTestData.RegisterAsync(database, time, "parcels-superseded", notify: "[channel]");
        DateTimeOffset slot = DaemonTestData.ReferenceEnd.AddHours(1);
        CheckResult result = new()
        {
            Check = CheckNames.Features,
            State = new CheckState(),
            Findings = [new Finding { Check = CheckNames.Features, Subject = "stops", Statistic = "psi", Severity = Severity.Critical, RequiresPersistence = false, Value = 0.4, Limit = 0.25, Explanation = "PSI of stops" }],
        };
        IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate([result], [], "fingerprint-1", new CheckThresholds());
        RecordedRun recorded = await DaemonTestData.RecordUnderLeaseAsync(database, "parcels-superseded", slot, [result], decisions);
        long alert = recorded.Transitions[0].AlertId;

        // The recorded run names no baseline version, as alerts opened before schema 4 do: it counts as raised against version 1.
        ActivationOutcome outcome;
        await using (StoreDataSources databases = DaemonTestData.DataSources(database.ConnectionString))
        {
            PreparedBaseline prepared = await new BaselineService(databases, time, DaemonTestData.CommandTimeout)
                .PrepareFitAsync("parcels-superseded", DaemonTestData.Start, DaemonTestData.Start.AddHours(12), CancellationToken.None);
            outcome = await new BaselineActivation(database.DataSource, time, DaemonTestData.CommandTimeout).StoreAsync(prepared, "owner@example.test", keepAlerts: false, CancellationToken.None);
        }

        Assert.Equal([alert], outcome.Superseded);
        Assert.Equal(2, outcome.Version);
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource,
            $"SELECT count(*) FROM modelwatch.alert WHERE id = {alert} AND state = 'resolved' AND resolved_by = 'owner@example.test' AND resolved_at = '{time.GetUtcNow():O}'::timestamptz"));
        Assert.Equal("superseded: model now watched against baseline 2 (was 1)", await DaemonTestData.TextAsync(database.DataSource,
            $"SELECT explanation FROM modelwatch.alert_event WHERE alert_id = {alert} AND transition = 'superseded'"));
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource,
            $"SELECT count(*) FROM modelwatch.notification n JOIN modelwatch.alert_event e ON e.id = n.alert_event_id WHERE e.alert_id = {alert} AND e.transition = 'superseded' AND n.target = 'channel' AND n.state = 'pending'"));
        Assert.Equal(2, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT active_baseline_version FROM modelwatch.model WHERE key = 'parcels-superseded'"));
    }
}
