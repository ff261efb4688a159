using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Store.Local;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Daemon.Tests.Scheduling;

/// <summary>Restarts the state database under a running daemon, on a throwaway cluster of its own (the shared one stays up).</summary>
public sealed class DatabaseRestartTests
{
    [Fact]
    public async Task A_database_restart_loses_no_slot_and_no_alert_transition_and_duplicates_none()
    {
        string binaries = ThrowawayCluster.FindBinaries() ?? throw new InvalidOperationException("this test needs PostgreSQL server binaries (apt-get install postgresql)");
        await using ThrowawayCluster cluster = await ThrowawayCluster.StartAsync(binaries);
        string connectionString = new NpgsqlConnectionStringBuilder(cluster.ConnectionString) { Timeout = 3, CommandTimeout = 10 }.ConnectionString;
        await using NpgsqlDataSource source = NpgsqlDataSource.Create(connectionString);
        await DaemonTestData.PrepareAsync(source, hours: 24 + 30, breakAtHour: 24 + 6);
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(source, connectionString, time, "parcels-restart");
        await using var daemon = new DaemonInstance(connectionString, time, "restarting", settings: new Dictionary<string, string?> { ["Daemon:MissedSlots"] = "CatchUp", ["Daemon:LeaseDuration"] = "00:10:00" });
        await daemon.StartAsync();
        const string runs = "SELECT count(*) FROM modelwatch.run WHERE model_key = 'parcels-restart'";
        for (int hour = 1; hour <= 8; hour++)
        {
            await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), source, runs, hour);
        }

        await cluster.StopServerAsync();
        for (int hour = 9; hour <= 11; hour++)
        {
            time.SetUtcNow(DaemonTestData.ReferenceEnd.AddHours(hour));
            await daemon.WaitForCycleAsync(time);
        }

        Assert.False(daemon.Health.DatabaseReady);
        NpgsqlConnection.ClearAllPools();
        await cluster.StartServerAsync();
        for (int hour = 12; hour <= 20; hour++)
        {
            await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), source, runs, hour, TimeSpan.FromSeconds(90));
        }

        await daemon.StopAsync();
        Assert.True(daemon.Health.DatabaseReady);
        Assert.Equal(20, await DaemonTestData.ScalarAsync(source, runs));
        Assert.Equal(20, await DaemonTestData.ScalarAsync(source, "SELECT count(DISTINCT slot) FROM modelwatch.run WHERE model_key = 'parcels-restart'"));
        Assert.Equal(1, await DaemonTestData.ScalarAsync(source, """
            SELECT count(*) FROM modelwatch.alert_event e JOIN modelwatch.alert a ON a.id = e.alert_id
             WHERE a.model_key = 'parcels-restart' AND a.check_name = 'coefficients' AND a.subject IS NULL AND e.transition = 'opened'
            """));
        Assert.Equal(
            await DaemonTestData.ScalarAsync(source, "SELECT count(*) FROM modelwatch.alert WHERE model_key = 'parcels-restart'"),
            await DaemonTestData.ScalarAsync(source, "SELECT count(*) FROM modelwatch.alert_event e JOIN modelwatch.alert a ON a.id = e.alert_id WHERE a.model_key = 'parcels-restart' AND e.transition = 'opened'"));
    }
}
