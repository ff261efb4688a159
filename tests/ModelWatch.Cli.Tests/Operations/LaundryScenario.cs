using System.Globalization;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Operations;

/// <summary>
/// Invented data for the operator commands: a laundry service's wash cycles every five minutes from 2026-02-01,
/// the cycle's minutes explained by load, soil level and water hardness plus a deterministic wobble. At
/// <see cref="Break"/> (noon on the second day) the minutes per kilogram of load double — an invented change of
/// the relationship (say, a new machine programme). The baseline is fitted on the first day through the CLI.
/// </summary>
internal static class LaundryScenario
{
    public const string Key = "laundry-cycles";

    public static readonly DateTimeOffset Start = new(2026, 2, 1, 0, 0, 0, TimeSpan.Zero);

    /// <summary>End of the reference day; monitoring starts here.</summary>
    public static readonly DateTimeOffset ReferenceEnd = Start.AddDays(1);

    /// <summary>When the minutes per kilogram double.</summary>
    public static readonly DateTimeOffset Break = Start.AddHours(36);

    private const int Hours = 48;

    /// <summary>Creates the rows, the model and its baseline once per database (xUnit builds a test class per test).</summary>
    public static async Task PrepareAsync(PostgresDatabase database, string folder)
    {
        await using (NpgsqlCommand exists = database.DataSource.CreateCommand("SELECT to_regclass('wash_cycles') IS NOT NULL"))
        {
            if ((bool)(await exists.ExecuteScalarAsync())!)
            {
                return;
            }
        }

        int breakRow = (int)(Break - Start).TotalMinutes / 5;
        await using (NpgsqlCommand create = database.DataSource.CreateCommand($"""
            CREATE TABLE wash_cycles (finished_at timestamptz NOT NULL, load_kg float8, soil_level int4, hardness float8, minutes float8);
            INSERT INTO wash_cycles
            SELECT timestamptz '2026-02-01 00:00:00+00' + g * interval '5 minutes', l, s, h,
                   20 + (CASE WHEN g >= {breakRow} THEN 6 ELSE 3 END) * l + 4 * s + 1.5 * h + 3 * sin(g * 2.3) + 2 * cos(g * 0.71)
            FROM generate_series(0, {(Hours * 12) - 1}) g,
                 LATERAL (SELECT ((g * 37) % 101) / 10.0 + 1 AS l, (g * 7) % 5 AS s, ((g * 11) % 53) / 4.0 AS h) v;
            """))
        {
            await create.ExecuteNonQueryAsync();
        }

        string spec = Path.Combine(folder, Key + ".yaml");
        await File.WriteAllTextAsync(spec, $"""
            key: {Key}
            description: Wash cycle minutes (invented test data)
            query: SELECT finished_at, load_kg, soil_level, hardness, minutes FROM wash_cycles WHERE finished_at >= @window_start AND finished_at < @window_end
            time_column: finished_at
            outcome: minutes
            features: [load_kg, soil_level, hardness]
            schedule: 1h
            window: 2h
            min_rows: 20
            """);
        await Expect(database, "migrate");
        await Expect(database, "model", "apply", spec);
        await Expect(database, "baseline", "fit", Key, "--from", Time(Start), "--to", Time(ReferenceEnd));
    }

    public static string Time(DateTimeOffset time) => time.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    public static Task<CliRun> Cli(PostgresDatabase database, params string[] args) =>
        CliRun.InvokeAsync([.. args, "--database", database.ConnectionString]);

    /// <summary>Rows in every table a run, its findings and the alert policy write to.</summary>
    public static async Task<string> StoredCountsAsync(PostgresDatabase database)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand("""
            SELECT format('run=%s finding=%s alert=%s alert_event=%s check_state=%s alert_policy_state=%s model=%s',
                   (SELECT count(*) FROM modelwatch.run), (SELECT count(*) FROM modelwatch.finding),
                   (SELECT count(*) FROM modelwatch.alert), (SELECT count(*) FROM modelwatch.alert_event),
                   (SELECT count(*) FROM modelwatch.check_state), (SELECT count(*) FROM modelwatch.alert_policy_state),
                   (SELECT string_agg(concat_ws('|', key, next_due_slot, lease_owner, lease_expires_at, updated_at), ',') FROM modelwatch.model))
            """);
        return (string)(await command.ExecuteScalarAsync())!;
    }

    private static async Task Expect(PostgresDatabase database, params string[] args)
    {
        CliRun run = await Cli(database, args);
        Assert.True(run.ExitCode == 0, $"modelwatch {string.Join(' ', args)} exited {run.ExitCode}: {run.Error}");
    }
}
