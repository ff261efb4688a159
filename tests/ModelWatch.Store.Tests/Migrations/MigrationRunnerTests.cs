using ModelWatch.Store.Migrations;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Store.Tests.Migrations;

public sealed class MigrationRunnerTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task Migrate_from_empty_creates_every_table_and_a_second_run_applies_nothing()
    {
        await using ScratchDatabase scratch = await ScratchDatabase.CreateAsync(database.Server);

        MigrationResult first = await MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None);
        MigrationResult second = await MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None);

        Assert.Equal(Enumerable.Range(1, MigrationRunner.LatestVersion), first.Applied);
        Assert.Equal(MigrationRunner.LatestVersion, first.CurrentVersion);
        Assert.Empty(second.Applied);
        Assert.Equal(MigrationRunner.LatestVersion, second.CurrentVersion);
        long tables = await StoreTestData.CountAsync(scratch.DataSource,
            "SELECT count(*) FROM information_schema.tables WHERE table_schema = 'modelwatch' AND table_name IN ('schema_version','model','baseline','run','finding','alert','check_state')");
        Assert.Equal(7, tables);
        Assert.Equal(MigrationRunner.LatestVersion, await StoreTestData.CountAsync(scratch.DataSource, "SELECT count(*) FROM modelwatch.schema_version"));
    }

    [Fact]
    public async Task Two_migrators_started_together_both_succeed_and_apply_each_script_once()
    {
        await using ScratchDatabase scratch = await ScratchDatabase.CreateAsync(database.Server);
        await using NpgsqlDataSource second = scratch.Server.OpenDataSource(scratch.Name);

        MigrationResult[] results = await Task.WhenAll(
            Task.Run(() => MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None)),
            Task.Run(() => MigrationRunner.MigrateAsync(second, StoreTestData.CommandTimeout, CancellationToken.None)));

        Assert.Equal(MigrationRunner.LatestVersion, results.Sum(r => r.Applied.Count));
        Assert.All(results, r => Assert.Equal(MigrationRunner.LatestVersion, r.CurrentVersion));
        Assert.Equal(MigrationRunner.LatestVersion, await StoreTestData.CountAsync(scratch.DataSource, "SELECT count(*) FROM modelwatch.schema_version"));
    }

    [Fact]
    public async Task An_applied_script_whose_checksum_changed_stops_the_run_and_changes_nothing()
    {
        await using ScratchDatabase scratch = await ScratchDatabase.CreateAsync(database.Server);
        await MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None);
        await using (NpgsqlCommand tamper = scratch.DataSource.CreateCommand("UPDATE modelwatch.schema_version SET checksum = 'edited' WHERE version = 1"))
        {
            await tamper.ExecuteNonQueryAsync();
        }

        var ex = await Assert.ThrowsAsync<MigrationException>(() => MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None));

        Assert.Contains("0001_initial", ex.Message, StringComparison.Ordinal);
        Assert.Contains("changed after it was applied", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_database_newer_than_the_build_is_refused()
    {
        await using ScratchDatabase scratch = await ScratchDatabase.CreateAsync(database.Server);
        await MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None);
        await using (NpgsqlCommand future = scratch.DataSource.CreateCommand("INSERT INTO modelwatch.schema_version (version, name, checksum) VALUES (999, 'future', 'x')"))
        {
            await future.ExecuteNonQueryAsync();
        }

        var ex = await Assert.ThrowsAsync<MigrationException>(() => MigrationRunner.MigrateAsync(scratch.DataSource, StoreTestData.CommandTimeout, CancellationToken.None));

        Assert.Contains("newer than this build", ex.Message, StringComparison.Ordinal);
    }
}
