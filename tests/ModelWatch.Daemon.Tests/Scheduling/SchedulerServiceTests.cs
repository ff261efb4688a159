using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;
using Xunit.Abstractions;

namespace ModelWatch.Daemon.Tests.Scheduling;

public sealed class SchedulerServiceTests(PostgresDatabase database, ITestOutputHelper output) : IClassFixture<PostgresDatabase>
{
    private const int Slots = 110;

    [Fact]
    public async Task Two_daemons_run_each_due_model_exactly_once_per_slot()
    {
        await DaemonTestData.PrepareAsync(database, hours: 24 + Slots + 2);
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        string[] keys = ["parcels-north", "parcels-south", "parcels-east"];
        foreach (string key in keys)
        {
            await DaemonTestData.RegisterAsync(database, time, key);
        }

        await using var first = new DaemonInstance(database, time, "replica-1");
        await using var second = new DaemonInstance(database, time, "replica-2");
        await first.StartAsync();
        await second.StartAsync();
        for (int hour = 1; hour <= Slots; hour++)
        {
            await DaemonTestData.StepToAsync(
                time,
                DaemonTestData.ReferenceEnd.AddHours(hour),
                database.DataSource,
                $"SELECT count(*) FROM modelwatch.run WHERE slot <= '{DaemonTestData.ReferenceEnd.AddHours(hour):O}'::timestamptz AND slot > '{DaemonTestData.ReferenceEnd:O}'::timestamptz",
                keys.Length * hour);
        }

        await first.StopAsync();
        await second.StopAsync();
        long runs = await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run");
        long distinct = await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(DISTINCT (model_key, slot)) FROM modelwatch.run");
        long byFirst = await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE worker_id = 'replica-1'");
        long failed = await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE status <> 'ok'");
        long gaps = await DaemonTestData.ScalarAsync(database.DataSource, """
            SELECT count(*) FROM (
              SELECT slot - lag(slot) OVER (PARTITION BY model_key ORDER BY slot) AS step FROM modelwatch.run) s
            WHERE step IS NOT NULL AND step <> interval '1 hour'
            """);
        output.WriteLine($"runs {runs}, replica-1 {byFirst}, replica-2 {runs - byFirst}, not ok {failed}");

        Assert.Equal(keys.Length * Slots, runs);
        Assert.Equal(runs, distinct);
        Assert.Equal(0, gaps);
        Assert.Equal(0, failed);
        Assert.Equal(0, first.Logs.Count(1301) + second.Logs.Count(1301) + first.Logs.Count(1302) + second.Logs.Count(1302));
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.model WHERE lease_owner IS NOT NULL"));
    }
}
