using System.Security.Cryptography;
using System.Text;
using Dapper;
using ModelWatch.Store.Migrations;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Testing.Postgres;
using ModelWatch.Testing.Repository;
using Npgsql;

namespace ModelWatch.Store.Tests.Migrations;

/// <summary>
/// Schema 4 on a database that schema 3 filled: alert numbers are kept, a 'reopened' alert becomes an 'opened' one
/// naming its predecessor, silences become quiet periods, notifications a silence skipped become held, and new
/// alerts number after the largest old one rather than after the last run.
/// </summary>
public sealed class TriageMigrationTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task Schema_3_state_moves_into_schema_4_with_alert_numbers_kept_and_predecessors_named()
    {
        await using ScratchDatabase scratch = await ScratchDatabase.CreateAsync(database.Server);
        await using NpgsqlConnection connection = await scratch.DataSource.OpenConnectionAsync();
        await ApplyScriptsUpToAsync(connection, 3);
        // Schema 3 drew run and alert ids from one sequence: runs 10 and 12, alerts 11 and 13, later runs up to 20.
        await connection.ExecuteAsync("""
            INSERT INTO modelwatch.model (key, spec, spec_sha256, design_signature, schedule) VALUES ('kiln-hours', '{}', 'x', 'y', '1h');
            INSERT INTO modelwatch.run (id, model_key, slot, status, worker_id, started_at) VALUES
                 (10, 'kiln-hours', '2026-01-01T00:00Z', 'ok', 'w', '2026-01-01T00:00Z'),
                 (12, 'kiln-hours', '2026-01-01T01:00Z', 'ok', 'w', '2026-01-01T01:00Z');
            INSERT INTO modelwatch.alert (id, model_key, check_name, severity, state, opened_at, opened_by, resolved_at, resolved_by, first_run_id, last_run_id)
                 VALUES (11, 'kiln-hours', 'error', 'critical', 'resolved', '2026-01-01T01:00Z', 'daemon:w', '2026-01-01T05:00Z', 'daemon:w', 10, 10);
            INSERT INTO modelwatch.alert (id, model_key, check_name, severity, state, opened_at, opened_by, first_run_id, last_run_id)
                 VALUES (13, 'kiln-hours', 'error', 'warning', 'open', '2026-01-02T01:00Z', 'daemon:w', 12, 12);
            SELECT setval('modelwatch.object_id', 20);
            INSERT INTO modelwatch.alert_event (alert_id, transition, severity, state, actor, at, explanation) VALUES
                 (11, 'opened', 'critical', 'open', 'daemon:w', '2026-01-01T01:00Z', 'error up'),
                 (11, 'resolved', 'critical', 'resolved', 'daemon:w', '2026-01-01T05:00Z', 'error back'),
                 (13, 'reopened', 'warning', 'open', 'daemon:w', '2026-01-02T01:00Z', 'error up again');
            INSERT INTO modelwatch.silence (model_key, until, reason, created_by, created_at) VALUES ('kiln-hours', '2099-01-01Z', 'kiln relined', 'ops', '2026-01-02Z');
            INSERT INTO modelwatch.notification (alert_event_id, alert_id, target, state, created_at, detail)
                 SELECT id, 13, 'pager', 'skipped', '2026-01-02Z', 'silenced' FROM modelwatch.alert_event WHERE transition = 'reopened';
            """);

        MigrationResult result = await MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None);

        Assert.Equal([4], result.Applied);
        var alerts = (await connection.QueryAsync<(long Id, long? Previous)>("SELECT id, previous_alert_id FROM modelwatch.alert ORDER BY id")).ToList();
        Assert.Equal([(11L, (long?)null), (13L, 11L)], alerts);
        Assert.Equal(["opened", "resolved", "opened"], await connection.QueryAsync<string>("SELECT transition FROM modelwatch.alert_event ORDER BY id"));
        Assert.Equal("kiln relined", await connection.ExecuteScalarAsync<string>("SELECT reason FROM modelwatch.quiet_period"));
        Assert.Equal("held", await connection.ExecuteScalarAsync<string>("SELECT state FROM modelwatch.notification"));

        long next = await connection.ExecuteScalarAsync<long>("""
            INSERT INTO modelwatch.alert (model_key, check_name, subject, severity, state, opened_at, opened_by)
            VALUES ('kiln-hours', 'features', 'kiln_temp', 'warning', 'open', now(), 'daemon:w') RETURNING id
            """);
        long nextRun = await connection.ExecuteScalarAsync<long>(
            "INSERT INTO modelwatch.run (model_key, slot, status, worker_id, started_at) VALUES ('kiln-hours', '2026-01-01T02:00Z', 'ok', 'w', now()) RETURNING id");
        Assert.Equal(14, next);
        Assert.Equal(21, nextRun);
    }

    /// <summary>Applies the committed scripts 1..<paramref name="version"/> as the runner of that release did.</summary>
    private static async Task ApplyScriptsUpToAsync(NpgsqlConnection connection, int version)
    {
        await connection.ExecuteAsync(
            "CREATE SCHEMA modelwatch; CREATE TABLE modelwatch.schema_version (version integer PRIMARY KEY, name text NOT NULL, checksum text NOT NULL, applied_at timestamptz NOT NULL DEFAULT now())");
        string folder = Path.Combine(RepositoryFiles.Root(), "src", "ModelWatch.Store", "Migrations", "Scripts");
        foreach (string file in Directory.GetFiles(folder, "*.sql").Order(StringComparer.Ordinal).Take(version))
        {
            string sql = (await File.ReadAllTextAsync(file)).Replace("\r\n", "\n", StringComparison.Ordinal);
            string name = Path.GetFileNameWithoutExtension(file);
            await connection.ExecuteAsync(sql);
            await connection.ExecuteAsync(
                "INSERT INTO modelwatch.schema_version (version, name, checksum) VALUES (@version, @name, @checksum)",
                new { version = int.Parse(name[..4], System.Globalization.CultureInfo.InvariantCulture), name = name[5..], checksum = Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(sql))) });
        }
    }
}
