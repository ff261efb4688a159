using System.Globalization;
using System.Text.Json;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Operations;

/// <summary>
/// A finding's p-value, alpha and limit recorded by <c>check --record</c> on a real PostgreSQL: stored in
/// <c>modelwatch.finding</c>, read back by <c>runs show</c>, and copied to the alert event the evidence opened.
/// </summary>
public sealed class RecordedFindingTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-recorded-finding-").FullName;

    public Task InitializeAsync() => LaundryScenario.PrepareAsync(database, _folder);

    public Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        return Task.CompletedTask;
    }

    [Fact]
    public async Task Alpha_and_limit_round_trip_through_the_state_database_into_runs_show_and_the_alert_event()
    {
        CliRun check = await LaundryScenario.Cli(database, "check", LaundryScenario.Key, "--at", "2026-02-02T15:10:00Z", "--record", "--format", "json");
        Assert.True(check.ExitCode == ExitCodes.Ok, check.Error);
        long runId = long.Parse(await Scalar("SELECT max(id) FROM modelwatch.run"), CultureInfo.InvariantCulture);
        using JsonDocument printed = JsonDocument.Parse(check.Output);
        JsonElement[] checkFindings = [.. printed.RootElement.GetProperty("findings").EnumerateArray()];

        CliRun show = await LaundryScenario.Cli(database, "runs", "show", runId.ToString(CultureInfo.InvariantCulture), "--format", "json");
        Assert.True(show.ExitCode == ExitCodes.Ok, show.Error);
        using JsonDocument shown = JsonDocument.Parse(show.Output);
        Assert.Equal(runId, shown.RootElement.GetProperty("id").GetInt64());
        JsonElement[] stored = [.. shown.RootElement.GetProperty("findings").EnumerateArray()];

        // Every finding check printed comes back from the database with the same numbers (skipped ones are stored too).
        foreach (JsonElement f in checkFindings)
        {
            string[] fields = ["value", "threshold", "p_value", "alpha", "limit"];
            Assert.True(
                stored.Any(s => Key(s) == Key(f) && fields.All(field => Number(s, field) == Number(f, field))),
                "not stored as printed: " + f);
        }

        // Skipped tests are stored too, and shown as skipped with their reason, never as ok.
        Assert.All(stored, s => Assert.Equal(s.GetProperty("skip_reason").ValueKind == JsonValueKind.Null, s.GetProperty("severity").GetString() != "skipped"));
        Assert.Equal(
            stored.Length - checkFindings.Length,
            stored.Count(s => s.GetProperty("severity").GetString() == "skipped"));

        JsonElement wald = stored.Single(s => s.GetProperty("statistic").GetString() == "wald");
        Assert.NotNull(Number(wald, "alpha"));
        Assert.NotNull(Number(wald, "limit"));
        Assert.Equal(Number(wald, "alpha"), Number(wald, "threshold"));
        Assert.Equal(Number(wald, "alpha"), await Double($"SELECT alpha FROM modelwatch.finding WHERE run_id = {runId} AND statistic = 'wald'"));
        Assert.Equal(Number(wald, "limit"), await Double($"SELECT limit_value FROM modelwatch.finding WHERE run_id = {runId} AND statistic = 'wald'"));

        // The run opened alerts from evidence that needs no repetition; each event carries its evidence's p-value, alpha and limit.
        string events = await Scalar(
            $"""
            SELECT count(*) FROM modelwatch.alert_event e
              JOIN modelwatch.alert a ON a.id = e.alert_id
              JOIN modelwatch.finding f ON f.run_id = e.run_id AND f.check_name = a.check_name AND f.subject IS NOT DISTINCT FROM a.subject
                                        AND f.statistic = e.statistic
             WHERE e.run_id = {runId} AND e.transition = 'opened'
               AND e.p_value IS NOT DISTINCT FROM f.p_value AND e.alpha IS NOT DISTINCT FROM f.alpha
               AND e.limit_value IS NOT DISTINCT FROM f.limit_value AND e.limit_value IS NOT NULL
            """);
        Assert.NotEqual("0", events);
        Assert.Equal(events, await Scalar($"SELECT count(*) FROM modelwatch.alert_event WHERE run_id = {runId} AND transition = 'opened'"));
    }

    [Fact]
    public async Task Runs_show_of_a_run_that_does_not_exist_exits_3_naming_it()
    {
        CliRun run = await LaundryScenario.Cli(database, "runs", "show", "987654");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("modelwatch runs show: run 987654 does not exist", run.Error, StringComparison.Ordinal);
    }

    private static string Key(JsonElement f) =>
        f.GetProperty("check").GetString() + "/" + f.GetProperty("statistic").GetString() + "/" + f.GetProperty("subject").GetString();

    private static double? Number(JsonElement finding, string name) =>
        finding.GetProperty(name).ValueKind == JsonValueKind.Null ? null : finding.GetProperty(name).GetDouble();

    private async Task<double> Double(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return (double)(await command.ExecuteScalarAsync())!;
    }

    private async Task<string> Scalar(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return Convert.ToString(await command.ExecuteScalarAsync(), CultureInfo.InvariantCulture)!;
    }
}
