using Microsoft.Extensions.Configuration;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Daemon.Execution;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Daemon.Tests.Support;

/// <summary>
/// Invented data for daemon tests: a parcel service's shipments every five minutes from 2026-01-01, with the
/// handling time in minutes explained by distance, stops and weight plus a deterministic wobble.
/// </summary>
internal static class DaemonTestData
{
    public static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);

    public static readonly TimeSpan CommandTimeout = TimeSpan.FromSeconds(60);

    /// <summary>Reference period for baselines: the first day.</summary>
    public static readonly DateTimeOffset ReferenceEnd = Start.AddDays(1);

    /// <summary>
    /// Creates the shipments; from <paramref name="breakAtHour"/> on (hours after <see cref="Start"/>), the minutes
    /// per km double, an invented change of the relationship for alert tests.
    /// </summary>
    public static Task PrepareAsync(PostgresDatabase database, int hours, int? breakAtHour = null) =>
        PrepareAsync(database.DataSource, hours, breakAtHour);

    /// <inheritdoc cref="PrepareAsync(PostgresDatabase, int, int?)"/>
    public static async Task PrepareAsync(NpgsqlDataSource source, int hours, int? breakAtHour = null)
    {
        int breakRow = (breakAtHour ?? int.MaxValue / 24) * 12;
        await MigrationRunner.MigrateAsync(source, CommandTimeout, CancellationToken.None);
        await using NpgsqlCommand command = source.CreateCommand($"""
            CREATE TABLE IF NOT EXISTS shipments (shipped_at timestamptz NOT NULL, distance_km float8, stops int4, weight_kg float8, minutes float8);
            TRUNCATE shipments;
            INSERT INTO shipments
            SELECT timestamptz '2026-01-01 00:00:00+00' + g * interval '5 minutes', d, s, w,
                   5 + (CASE WHEN g >= {breakRow} THEN 4 ELSE 2 END) * d + 3 * s + 0.5 * w + 3 * sin(g * 2.3) + 2 * cos(g * 0.71)
            FROM generate_series(0, {(hours * 12) - 1}) g,
                 LATERAL (SELECT ((g * 37) % 101) / 5.0 + 1 AS d, (g * 7) % 13 AS s, ((g * 11) % 53) / 3.0 AS w) v;
            """);
        await command.ExecuteNonQueryAsync();
    }

    public static string Yaml(string key, string? query = null, string notify = "[]") => $"""
        key: {key}
        description: Parcel handling minutes (invented test data)
        query: |
          {query ?? "SELECT shipped_at, distance_km, stops, weight_kg, minutes FROM shipments WHERE shipped_at >= @window_start AND shipped_at < @window_end"}
        time_column: shipped_at
        outcome: minutes
        features: [distance_km, stops, weight_kg]
        schedule: 1h
        window: 2h
        min_rows: 20
        notify: {notify}
        """;

    /// <summary>Registers a model and fits its baseline on the reference day.</summary>
    public static Task RegisterAsync(PostgresDatabase database, TimeProvider time, string key, string? query = null, bool fitBaseline = true, string notify = "[]") =>
        RegisterAsync(database.DataSource, database.ConnectionString, time, key, query, fitBaseline, notify);

    /// <inheritdoc cref="RegisterAsync(PostgresDatabase, TimeProvider, string, string?, bool)"/>
    public static async Task RegisterAsync(NpgsqlDataSource source, string connectionString, TimeProvider time, string key, string? query = null, bool fitBaseline = true, string notify = "[]")
    {
        var problems = new List<SpecProblem>();
        ModelSpec spec = ModelSpecValidator.FromYaml(key + ".yaml", Yaml(key, query, notify), problems) ?? throw new ModelSpecException(problems);
        await new ModelRepository(source, time, CommandTimeout).ApplyAsync([(spec, null)], prune: false, CancellationToken.None);
        if (fitBaseline)
        {
            await using StoreDataSources databases = DataSources(connectionString);
            await new BaselineService(databases, time, CommandTimeout).FitAsync(key, Start, ReferenceEnd, "test", CancellationToken.None);
        }
    }

    /// <summary>Re-applies a model's spec with another query (its design, and so its baseline, stay valid).</summary>
    public static async Task ApplyQueryAsync(PostgresDatabase database, TimeProvider time, string key, string query)
    {
        var problems = new List<SpecProblem>();
        ModelSpec spec = ModelSpecValidator.FromYaml(key + ".yaml", Yaml(key, query), problems) ?? throw new ModelSpecException(problems);
        await new ModelRepository(database.DataSource, time, CommandTimeout).ApplyAsync([(spec, null)], prune: false, CancellationToken.None);
    }

    /// <summary>
    /// Records a run of <paramref name="key"/> at <paramref name="slot"/> with the given results and decisions, as a
    /// replica holding the lease would (the lease is taken here, so no scheduler is needed).
    /// </summary>
    public static async Task<RecordedRun> RecordUnderLeaseAsync(PostgresDatabase database, string key, DateTimeOffset slot, CheckResult[] results, IReadOnlyList<AlertDecision> decisions)
    {
        const string worker = "test-recorder";
        await using (NpgsqlConnection connection = await database.DataSource.OpenConnectionAsync())
        {
            await using NpgsqlCommand lease = new("UPDATE modelwatch.model SET lease_owner = @worker, lease_expires_at = @expires WHERE key = @key", connection);
            lease.Parameters.AddWithValue("worker", worker);
            lease.Parameters.AddWithValue("expires", slot.AddMinutes(10));
            lease.Parameters.AddWithValue("key", key);
            await lease.ExecuteNonQueryAsync();
        }

        var recorder = new RunRecorder(database.DataSource, CommandTimeout);
        return await recorder.RecordAsync(
            new RunOutcome { ModelKey = key, Slot = slot, Status = RunStatus.Ok, StartedAt = slot, Results = results, Decisions = decisions },
            worker, slot.AddHours(1), slot.AddMinutes(1), CancellationToken.None);
    }

    public static StoreDataSources DataSources(string connectionString) =>
        new(new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?> { [ConnectionSettings.StateKey] = connectionString }).Build());

    public static async Task<string?> TextAsync(NpgsqlDataSource source, string sql)
    {
        await using NpgsqlCommand command = source.CreateCommand(sql);
        return (string?)await command.ExecuteScalarAsync();
    }

    public static async Task<long> ScalarAsync(NpgsqlDataSource source, string sql)
    {
        await using NpgsqlCommand command = source.CreateCommand(sql);
        return Convert.ToInt64(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture);
    }

    /// <summary>
    /// Moves the fake clock to <paramref name="target"/> and waits for database work until the query returns at least
    /// <paramref name="expected"/>. Meanwhile it nudges the clock on by a minute at a time (up to 50 minutes past the
    /// target), because a loop that arms its next poll just after the clock moved would otherwise wait for a minute of
    /// fake time that never comes.
    /// </summary>
    public static async Task StepToAsync(Microsoft.Extensions.Time.Testing.FakeTimeProvider time, DateTimeOffset target, NpgsqlDataSource source, string sql, long expected, TimeSpan? limit = null)
    {
        if (target > time.GetUtcNow())
        {
            time.SetUtcNow(target);
        }

        long started = TimeProvider.System.GetTimestamp();
        TimeSpan allowed = limit ?? TimeSpan.FromSeconds(60);
        long value;
        while ((value = await TryScalarAsync(source, sql)) < expected)
        {
            if (TimeProvider.System.GetElapsedTime(started) > allowed)
            {
                throw new TimeoutException($"'{sql}' returned {value}, expected at least {expected} (fake clock at {time.GetUtcNow():O})");
            }

            if (time.GetUtcNow() < target.AddMinutes(50))
            {
                time.Advance(TimeSpan.FromMinutes(1));
            }

            await Task.Delay(20);
        }
    }

    /// <summary>Like <see cref="ScalarAsync"/>, but −1 while the database is restarting (stale pooled connections fail once).</summary>
    private static async Task<long> TryScalarAsync(NpgsqlDataSource source, string sql)
    {
        try
        {
            return await ScalarAsync(source, sql);
        }
        catch (NpgsqlException)
        {
            source.Clear();
            return -1;
        }
    }
}
