using ModelWatch.Store.Migrations;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.StoreCommands;

/// <summary>Every command that touches the state database refuses a schema of another build, before it reads or writes.</summary>
public sealed class SchemaGuardTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task An_older_build_refuses_a_newer_schema_and_a_newer_build_asks_for_migrate()
    {
        Assert.Equal(0, (await Cli("migrate")).ExitCode);
        string spec = Path.Combine(Directory.CreateTempSubdirectory("mw-guard-").FullName, "guarded.yaml");
        File.WriteAllText(spec, """
            key: guarded
            query: SELECT at, x, y FROM nowhere WHERE at >= @window_start AND at < @window_end
            time_column: at
            outcome: y
            features: [x]
            schedule: 1h
            window: 1d
            """);
        string baseline = Path.Combine(Path.GetDirectoryName(spec)!, "baseline.json");
        File.WriteAllText(baseline, """{ "coefficients": { "(intercept)": 1.0, "x": 2.0 }, "residual_sd": 0.5, "n": 100 }""");

        // A newer build migrated this database to a version this build does not know.
        await ExecuteAsync($"INSERT INTO modelwatch.schema_version (version, name, checksum) VALUES ({MigrationRunner.LatestVersion + 1}, 'from_the_future', 'x')");
        foreach (string[] command in (string[][])[["model", "apply", spec], ["baseline", "import", "guarded", baseline], ["alerts", "list"], ["runs", "list"], ["check", "guarded"]])
        {
            CliRun run = await Cli(command);
            Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
            Assert.Contains($"the state database is at schema version {MigrationRunner.LatestVersion + 1}, newer than this build's {MigrationRunner.LatestVersion}: this build must not change it; upgrade modelwatch", run.Error, StringComparison.Ordinal);
        }

        Assert.Equal(0L, await ScalarAsync("SELECT count(*) FROM modelwatch.model"));
        Assert.Equal(0L, await ScalarAsync("SELECT count(*) FROM modelwatch.baseline"));

        // An older schema: this build asks for migrate instead of writing into it.
        await ExecuteAsync($"DELETE FROM modelwatch.schema_version WHERE version >= {MigrationRunner.LatestVersion}");
        CliRun older = await Cli("model", "apply", spec);
        Assert.Equal(ExitCodes.RuntimeError, older.ExitCode);
        Assert.Contains($"older than this build's {MigrationRunner.LatestVersion}; run 'modelwatch migrate'", older.Error, StringComparison.Ordinal);
        Assert.Equal(0L, await ScalarAsync("SELECT count(*) FROM modelwatch.model"));
    }

    private Task<CliRun> Cli(params string[] args) => CliRun.InvokeAsync([.. args, "--database", database.ConnectionString]);

    private async Task ExecuteAsync(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        await command.ExecuteNonQueryAsync();
    }

    private async Task<long> ScalarAsync(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return Convert.ToInt64(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture);
    }
}
