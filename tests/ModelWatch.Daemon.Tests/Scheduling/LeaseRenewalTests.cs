using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Scheduling;

/// <summary>Leases on the real clock: a run longer than its lease keeps it, and a missed slot is named truthfully.</summary>
public sealed class LeaseRenewalTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task A_run_longer_than_its_lease_keeps_the_lease_and_runs_once()
    {
        await DaemonTestData.PrepareAsync(database, hours: 48);
        await DaemonTestData.RegisterAsync(database, TimeProvider.System, "slow-query",
            "WITH pause AS (SELECT pg_sleep(9)) SELECT shipped_at, distance_km, stops, weight_kg, minutes FROM shipments, pause WHERE shipped_at >= @window_start AND shipped_at < @window_end");
        await DaemonTestData.ScalarAsync(database.DataSource, "WITH d AS (UPDATE modelwatch.model SET next_due_slot = '2026-01-02T00:00:00Z' WHERE key = 'slow-query' RETURNING 1) SELECT count(*) FROM d");

        // Two replicas poll every second; the lease (6 s) is shorter than the query (9 s).
        var settings = new Dictionary<string, string?> { ["Daemon:PollInterval"] = "00:00:01", ["Daemon:LeaseDuration"] = "00:00:06" };
        await using var first = new DaemonInstance(database, TimeProvider.System, "renewing-a", concurrency: 1, settings);
        await using var second = new DaemonInstance(database, TimeProvider.System, "renewing-b", concurrency: 1, settings);
        await first.StartAsync();
        await second.StartAsync();
        long started = TimeProvider.System.GetTimestamp();
        while (await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'slow-query'") == 0)
        {
            Assert.True(TimeProvider.System.GetElapsedTime(started) < TimeSpan.FromSeconds(60), "the slow run was never recorded");
            await Task.Delay(200);
        }

        // Give the other replica time to take the model over if the lease had lapsed.
        await Task.Delay(TimeSpan.FromSeconds(8));
        await first.StopAsync();
        await second.StopAsync();

        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'slow-query'"));
        int[] raced = [1301, 1302, 1010];
        Assert.DoesNotContain(first.Logs.Records, r => raced.Contains(r.EventId));
        Assert.DoesNotContain(second.Logs.Records, r => raced.Contains(r.EventId));

        // Exactly one replica read the window: only one logged the run at all.
        Assert.Equal(1, first.Logs.Records.Count(r => r.EventId == 1303 && r.Message.Contains("slow-query", StringComparison.Ordinal))
            + second.Logs.Records.Count(r => r.EventId == 1303 && r.Message.Contains("slow-query", StringComparison.Ordinal)));
    }
}
