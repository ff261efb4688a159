using System.Text.Json;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Operations;

/// <summary>
/// <c>modelwatch check --at</c> for a past slot on a real PostgreSQL, after a later slot has been recorded so that the
/// live run memory lies in the slot's future: the slot is evaluated as it stood then, exactly as a backtest sees it.
/// </summary>
public sealed class CheckAtTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    /// <summary>Inside the changed relationship: the backtest opens its alerts by 13:00.</summary>
    private const string InsideTheChange = "2026-02-02T16:00:00Z";

    /// <summary>A later slot, recorded first, so the live memory's last window ends after the slot asked about.</summary>
    private const string Recorded = "2026-02-02T23:00:00Z";

    private readonly string _folder = Directory.CreateTempSubdirectory("mw-checkat-").FullName;

    public async Task InitializeAsync()
    {
        await LaundryScenario.PrepareAsync(database, _folder);
        CliRun record = await Check("--at", Recorded, "--record");
        Assert.True(record.ExitCode is ExitCodes.Ok or ExitCodes.Findings, record.Error);
    }

    public Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        return Task.CompletedTask;
    }

    [Fact]
    public async Task A_past_slot_gives_the_findings_of_the_backtest_window_not_of_the_live_memory()
    {
        CliRun check = await Check("--at", InsideTheChange, "--format", "json", "--fail-on", "critical");
        CliRun backtest = await LaundryScenario.Cli(database, "backtest", LaundryScenario.Key, "--from", "2026-02-02T00:00:00Z", "--to", InsideTheChange, "--format", "json");

        Assert.True(check.ExitCode == ExitCodes.Findings, check.Output + check.Error);
        Assert.Contains("evaluated as it stood then: replayed 17 window(s) from 2026-02-02T00:00:00Z", check.Error, StringComparison.Ordinal);
        using JsonDocument run = JsonDocument.Parse(check.Output);
        using JsonDocument windows = JsonDocument.Parse(backtest.Output);
        JsonElement last = windows.RootElement.GetProperty("windows").EnumerateArray().Last();
        Assert.Equal(InsideTheChange, last.GetProperty("end").GetString());
        Assert.Equal("ok", run.RootElement.GetProperty("status").GetString());
        Assert.Equal(24, run.RootElement.GetProperty("rows").GetInt64());
        string[] fromCheck = Findings(run.RootElement.GetProperty("findings"));
        Assert.NotEmpty(fromCheck);
        Assert.Equal(Findings(last.GetProperty("findings")), fromCheck);
        Assert.Contains(fromCheck, f => f.StartsWith("residuals||critical|cusum|", StringComparison.Ordinal));
    }

    [Fact]
    public async Task The_table_says_critical_where_the_live_memory_said_no_new_rows()
    {
        CliRun check = await Check("--at", InsideTheChange);

        Assert.Equal(ExitCodes.Ok, check.ExitCode);
        Assert.Contains("status ok, 24 row(s) read, 0 rejected, worst severity critical", check.Output, StringComparison.Ordinal);
        Assert.DoesNotContain("no new usable rows", check.Output, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("2026-02-01T12:00:00Z", "the slot is before the end of baseline v1's reference window (2026-02-02T00:00:00Z)", "--from <first slot> --to 2026-02-01T12:00:00Z")]
    [InlineData("2026-06-01T00:00:00Z", "it lies more than 2000 windows after the end of the baseline's reference window", "--from 2026-02-02T00:00:00Z --to 2026-06-01T00:00:00Z")]
    public async Task A_slot_that_cannot_be_replayed_is_refused_with_exit_2_naming_backtest(string at, string reason, string range)
    {
        CliRun check = await Check("--at", at);

        Assert.Equal(ExitCodes.Usage, check.ExitCode);
        Assert.Contains($"modelwatch check: model laundry-cycles: check --at cannot evaluate slot {at} as it stood then: {reason}", check.Error, StringComparison.Ordinal);
        Assert.Contains($"Run 'modelwatch backtest laundry-cycles {range}'", check.Error, StringComparison.Ordinal);
        Assert.Equal(string.Empty, check.Output);
    }

    [Fact]
    public async Task A_replay_whose_first_window_has_lost_its_rows_is_refused()
    {
        // The same cycles in a table whose retention removed everything before 10:00 on the second day, after the
        // baseline was fitted on the first.
        await Execute("CREATE TABLE wash_cycles_pruned AS SELECT * FROM wash_cycles");
        string spec = Path.Combine(_folder, "laundry-pruned.yaml");
        await File.WriteAllTextAsync(spec, """
            key: laundry-pruned
            query: SELECT finished_at, load_kg, soil_level, hardness, minutes FROM wash_cycles_pruned WHERE finished_at >= @window_start AND finished_at < @window_end
            time_column: finished_at
            outcome: minutes
            features: [load_kg, soil_level, hardness]
            schedule: 1h
            window: 2h
            min_rows: 20
            """);
        Assert.Equal(ExitCodes.Ok, (await LaundryScenario.Cli(database, "model", "apply", spec)).ExitCode);
        Assert.Equal(ExitCodes.Ok, (await LaundryScenario.Cli(database, "baseline", "fit", "laundry-pruned", "--from", "2026-02-01T00:00:00Z", "--to", "2026-02-02T00:00:00Z")).ExitCode);
        await Execute("DELETE FROM wash_cycles_pruned WHERE finished_at < '2026-02-02T10:00:00Z'");

        CliRun check = await LaundryScenario.Cli(database, "check", "laundry-pruned", "--at", InsideTheChange);

        Assert.Equal(ExitCodes.Usage, check.ExitCode);
        Assert.Contains(
            "the source returns no rows for the first window of the replay (2026-02-01T22:00:00Z to 2026-02-02T00:00:00Z); the rows before the slot may have been removed. " +
            $"Run 'modelwatch backtest laundry-pruned --from 2026-02-02T00:00:00Z --to {InsideTheChange}'",
            check.Error,
            StringComparison.Ordinal);
    }

    [Fact]
    public async Task Record_refuses_a_slot_behind_the_recorded_history_and_writes_nothing()
    {
        string before = await LaundryScenario.StoredCountsAsync(database);

        CliRun check = await Check("--at", InsideTheChange, "--record");

        Assert.Equal(ExitCodes.Usage, check.ExitCode);
        Assert.Contains($"model laundry-cycles: slot {InsideTheChange} is behind the recorded history (the newest recorded slot is {Recorded}), and --record adds slots in order only", check.Error, StringComparison.Ordinal);
        Assert.Contains("modelwatch backtest laundry-cycles", check.Error, StringComparison.Ordinal);
        Assert.Equal(before, await LaundryScenario.StoredCountsAsync(database));
        Assert.Equal(1L, await Count("SELECT count(*) FROM modelwatch.run"));
    }

    private Task<CliRun> Check(params string[] extra) => LaundryScenario.Cli(database, ["check", LaundryScenario.Key, .. extra]);

    private static string[] Findings(JsonElement findings) =>
        [.. findings.EnumerateArray().Select(f => string.Join('|', f.EnumerateObject().Select(p => p.Value.ToString())))];

    private async Task Execute(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        await command.ExecuteNonQueryAsync();
    }

    private async Task<long> Count(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return Convert.ToInt64(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture);
    }
}
