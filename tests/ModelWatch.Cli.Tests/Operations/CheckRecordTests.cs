using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Operations;

/// <summary><c>modelwatch check --record</c> on a real PostgreSQL: one run per slot, recorded as a replica would.</summary>
public sealed class CheckRecordTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-record-").FullName;

    public Task InitializeAsync() => LaundryScenario.PrepareAsync(database, _folder);

    public Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        return Task.CompletedTask;
    }

    [Fact]
    public async Task Record_writes_one_run_and_a_second_record_of_the_slot_does_not_duplicate_it()
    {
        await Execute("UPDATE modelwatch.model SET next_due_slot = '2026-02-03T05:00:00Z' WHERE key = 'laundry-cycles'");

        CliRun first = await Check("--at", "2026-02-02T15:10:00Z", "--record", "--format", "json");
        CliRun second = await Check("--at", "2026-02-02T15:50:00Z", "--record");

        Assert.True(first.ExitCode == ExitCodes.Ok, first.Error);
        Assert.Contains("modelwatch check: recorded run ", first.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.Ok, second.ExitCode);
        Assert.Contains("slot 2026-02-02T15:00:00Z of model laundry-cycles was already recorded; nothing was written", second.Error, StringComparison.Ordinal);
        Assert.Equal("1", await Scalar("SELECT count(*) FROM modelwatch.run WHERE model_key = 'laundry-cycles'"));
        Assert.Equal("2026-02-02T15:00:00Z|ok|" + ModelWatch.Daemon.Alerts.Actors.CheckRun,
            await Scalar("SELECT concat_ws('|', to_char(slot AT TIME ZONE 'UTC', 'YYYY-MM-DD\"T\"HH24:MI:SS\"Z\"'), status, worker_id) FROM modelwatch.run"));
        Assert.NotEqual("0", await Scalar("SELECT count(*) FROM modelwatch.finding"));
        Assert.NotEqual("0", await Scalar("SELECT count(*) FROM modelwatch.check_state WHERE model_key = 'laundry-cycles'"));
        // The schedule is left as it was, and the lease is released.
        Assert.Equal("2026-02-03T05:00:00Z||", await Scalar("SELECT concat_ws('|', to_char(next_due_slot AT TIME ZONE 'UTC', 'YYYY-MM-DD\"T\"HH24:MI:SS\"Z\"'), coalesce(lease_owner, ''), coalesce(lease_expires_at::text, '')) FROM modelwatch.model"));
    }

    [Fact]
    public async Task Record_refuses_while_another_worker_holds_the_lease_and_writes_nothing()
    {
        await Execute("UPDATE modelwatch.model SET lease_owner = 'replica-7', lease_expires_at = '2999-01-01T00:00:00Z' WHERE key = 'laundry-cycles'");
        try
        {
            string runs = await Scalar("SELECT count(*) FROM modelwatch.run");

            CliRun run = await Check("--at", "2026-02-02T20:00:00Z", "--record");

            Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
            Assert.Contains("model laundry-cycles: replica-7 holds the lease until 2999-01-01T00:00:00Z", run.Error, StringComparison.Ordinal);
            Assert.Equal(runs, await Scalar("SELECT count(*) FROM modelwatch.run"));
        }
        finally
        {
            await Execute("UPDATE modelwatch.model SET lease_owner = NULL, lease_expires_at = NULL WHERE key = 'laundry-cycles'");
        }
    }

    private Task<CliRun> Check(params string[] extra) => LaundryScenario.Cli(database, ["check", LaundryScenario.Key, .. extra]);

    private async Task Execute(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        await command.ExecuteNonQueryAsync();
    }

    private async Task<string> Scalar(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return Convert.ToString(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture)!;
    }
}
