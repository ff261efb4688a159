using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Execution;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Scheduling;

public sealed class FaultToleranceTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    public async Task InitializeAsync()
    {
        // The tests of this class share a database: each starts with the models of the others disabled.
        await DaemonTestData.PrepareAsync(database, hours: 48);
        await DaemonTestData.ScalarAsync(database.DataSource, "WITH d AS (UPDATE modelwatch.model SET enabled = false, lease_owner = NULL, lease_expires_at = NULL RETURNING 1) SELECT count(*) FROM d");
    }

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public async Task A_broken_model_fails_its_runs_and_the_healthy_ones_carry_on()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "broken-sql", fitBaseline: true);
        await DaemonTestData.RegisterAsync(database, time, "healthy-one");
        await DaemonTestData.RegisterAsync(database, time, "healthy-two");

        // The broken model's source table disappears after its baseline was fitted: its query now fails.
        await DaemonTestData.ApplyQueryAsync(database, time, "broken-sql", "SELECT shipped_at, distance_km, stops, weight_kg, minutes FROM shipments_gone WHERE shipped_at >= @window_start AND shipped_at < @window_end");
        await using var daemon = new DaemonInstance(database, time, "solo", concurrency: 1);
        await daemon.StartAsync();
        for (int hour = 1; hour <= 4; hour++)
        {
            await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key IN ('broken-sql', 'healthy-one', 'healthy-two')", 3 * hour);
        }

        Assert.Equal(4, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'broken-sql' AND status = 'failed' AND reason LIKE '%shipments_gone%'"));
        Assert.Equal(8, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key LIKE 'healthy-%' AND status = 'ok'"));

        // Nobody is left to learn it from a log line: the third failure in a row opens the source alert (critical, at once),
        // naming the model and the last error; the healthy models have none.
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.alert WHERE model_key = 'broken-sql' AND check_name = 'source' AND severity = 'critical' AND state = 'open'"));
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.alert WHERE model_key LIKE 'healthy-%' AND check_name = 'source'"));
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, """
            SELECT count(*)
              FROM modelwatch.alert_event e JOIN modelwatch.run r ON r.id = e.run_id
             WHERE e.transition = 'opened' AND r.model_key = 'broken-sql'
               AND r.slot = (SELECT min(slot) FROM modelwatch.run WHERE model_key = 'broken-sql') + interval '2 hours'
               AND e.explanation LIKE '3 runs in a row failed since %; model broken-sql is not being watched (alert at %); last error: %shipments_gone%'
               AND e.statistic = 'failed_runs' AND e.value = 3 AND e.threshold = 3
            """));
        Assert.Equal(4, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.finding f JOIN modelwatch.run r ON r.id = f.run_id WHERE r.model_key = 'broken-sql' AND f.check_name = 'source'"));

        // The query is fixed: the first run that reads its window resolves the alert.
        await DaemonTestData.ApplyQueryAsync(database, time, "broken-sql", "SELECT shipped_at, distance_km, stops, weight_kg, minutes FROM shipments WHERE shipped_at >= @window_start AND shipped_at < @window_end");
        await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(5), database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key IN ('broken-sql', 'healthy-one', 'healthy-two')", 15);
        await daemon.StopAsync();
        Assert.Equal("ok", await DaemonTestData.TextAsync(database.DataSource, "SELECT status FROM modelwatch.run WHERE model_key = 'broken-sql' ORDER BY slot DESC LIMIT 1"));
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.alert WHERE model_key = 'broken-sql' AND check_name = 'source' AND state = 'resolved' AND resolved_by LIKE 'daemon:%'"));
    }

    [Fact]
    public async Task A_crashed_replicas_lease_expires_and_another_takes_the_slot_over_without_a_duplicate()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "takeover");
        var leases = new LeaseRepository(database.DataSource, DaemonTestData.CommandTimeout);
        time.Advance(TimeSpan.FromHours(1));

        // A replica claims the model and is killed before it records anything.
        IReadOnlyList<ClaimedModel> ghost = await leases.ClaimDueAsync("killed-replica", time.GetUtcNow(), TimeSpan.FromMinutes(10), 10, CancellationToken.None);
        Assert.Contains(ghost, c => c.Key == "takeover");
        await using var survivor = new DaemonInstance(database, time, "survivor", concurrency: 1);
        await survivor.StartAsync();
        time.Advance(TimeSpan.FromMinutes(5));
        await survivor.WaitForCycleAsync(time);
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'takeover'"));

        await DaemonTestData.StepToAsync(time, time.GetUtcNow().AddMinutes(6), database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'takeover'", 1);

        // The killed replica comes back and tries to record the same slot: its lease is gone, nothing is written.
        var recorder = new RunRecorder(database.DataSource, DaemonTestData.CommandTimeout);
        RecordedRun late = await recorder.RecordAsync(
            new RunOutcome { ModelKey = "takeover", Slot = ghost.Single(c => c.Key == "takeover").Slot, Status = RunStatus.Ok, StartedAt = time.GetUtcNow() },
            "killed-replica", time.GetUtcNow().AddHours(1), time.GetUtcNow(), CancellationToken.None);
        await survivor.StopAsync();

        Assert.True(late.LeaseLost);
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'takeover'"));
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'takeover' AND worker_id = 'survivor'"));
    }

    [Theory]
    [InlineData("LatestOnly", 1)]
    [InlineData("CatchUp", 4)]
    public async Task A_killed_replicas_slot_goes_to_the_missed_slot_policy_and_the_log_names_it(string policy, int runs)
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        string key = "killed-" + policy.ToLowerInvariant();
        await DaemonTestData.RegisterAsync(database, time, key);
        var leases = new LeaseRepository(database.DataSource, DaemonTestData.CommandTimeout);
        time.Advance(TimeSpan.FromHours(1));
        IReadOnlyList<ClaimedModel> ghost = await leases.ClaimDueAsync("killed-" + policy, time.GetUtcNow(), TimeSpan.FromMinutes(10), 10, CancellationToken.None);
        DateTimeOffset killedSlot = ghost.Single(c => c.Key == key).Slot;

        // The replica died with the claim; nobody runs for three hours.
        time.Advance(TimeSpan.FromHours(3));
        await using var survivor = new DaemonInstance(database, time, "after-" + policy, concurrency: 1, new Dictionary<string, string?> { ["Daemon:MissedSlots"] = policy });
        await survivor.StartAsync();
        await DaemonTestData.StepToAsync(time, time.GetUtcNow(), database.DataSource, $"SELECT count(*) FROM modelwatch.run WHERE model_key = '{key}'", runs);
        await survivor.StopAsync();

        string slots = await DaemonTestData.TextAsync(database.DataSource, $"SELECT string_agg(to_char(slot AT TIME ZONE 'UTC', 'HH24:MI'), ',' ORDER BY slot) FROM modelwatch.run WHERE model_key = '{key}'") ?? string.Empty;
        if (policy == "CatchUp")
        {
            // The killed slot is run after all, then the ones missed since.
            Assert.Equal("01:00,02:00,03:00,04:00", slots);
        }
        else
        {
            Assert.Equal("04:00", slots);
            string passed = Assert.Single(survivor.Logs.Records, r => r.EventId == 1004).Message;
            Assert.Contains($"Model {key}: 3 missed slot(s) from {killedSlot:O} passed over under MissedSlots=LatestOnly; running slot {killedSlot.AddHours(3):O}", passed, StringComparison.Ordinal);
        }
    }

    [Fact]
    public async Task Graceful_shutdown_finishes_within_its_timeout_and_releases_leases()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "shutdown-a");
        await DaemonTestData.RegisterAsync(database, time, "shutdown-b");
        await using var daemon = new DaemonInstance(database, time, "stopping", concurrency: 2);
        await daemon.StartAsync();
        await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(1), database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key LIKE 'shutdown-%'", 2);

        Task stopping = daemon.StopAsync();
        Task finished = await Task.WhenAny(stopping, Task.Delay(TimeSpan.FromSeconds(40)));

        Assert.Same(stopping, finished);
        Assert.Equal(1, daemon.Logs.Count(1007));
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.model WHERE lease_owner = 'stopping'"));
    }
}
