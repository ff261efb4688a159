using Dapper;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Options;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Options;
using ModelWatch.Daemon.Scheduling;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Store.Models;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Scheduling;

public sealed class HousekeepingTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    public Task InitializeAsync() => DaemonTestData.PrepareAsync(database, hours: 30);

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public async Task The_spec_folder_is_applied_and_a_removed_file_disables_its_model()
    {
        string folder = Directory.CreateTempSubdirectory("modelwatch-specs-").FullName;
        try
        {
            await File.WriteAllTextAsync(Path.Combine(folder, "folder-one.yaml"), DaemonTestData.Yaml("folder-one"));
            await File.WriteAllTextAsync(Path.Combine(folder, "folder-two.yaml"), DaemonTestData.Yaml("folder-two"));
            var models = new ModelRepository(database.DataSource, TimeProvider.System, DaemonTestData.CommandTimeout);
            var sync = new SpecDirectorySync(models, Microsoft.Extensions.Options.Options.Create(new SpecsOptions { Directory = folder, Prune = true }), TimeProvider.System, NullLogger<SpecDirectorySync>.Instance);

            Assert.True(await sync.SyncAsync(folder, CancellationToken.None));
            File.Delete(Path.Combine(folder, "folder-two.yaml"));
            Assert.True(await sync.SyncAsync(folder, CancellationToken.None));
            await File.WriteAllTextAsync(Path.Combine(folder, "broken.yaml"), "key: Not A Key\n");
            Assert.False(await sync.SyncAsync(folder, CancellationToken.None));

            Assert.True((await models.GetAsync("folder-one", CancellationToken.None))!.Enabled);
            Assert.False((await models.GetAsync("folder-two", CancellationToken.None))!.Enabled);
            Assert.Null(await models.GetAsync("not-a-key", CancellationToken.None));
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    [Fact]
    public async Task A_mistyped_check_or_setting_in_the_spec_folder_applies_nothing_and_says_where()
    {
        string folder = Directory.CreateTempSubdirectory("modelwatch-specs-").FullName;
        try
        {
            var models = new ModelRepository(database.DataSource, TimeProvider.System, DaemonTestData.CommandTimeout);
            using var logs = new CapturedLogs();
            using var factory = LoggerFactory.Create(b => b.AddProvider(logs));
            var sync = new SpecDirectorySync(models, Microsoft.Extensions.Options.Options.Create(new SpecsOptions { Directory = folder }), TimeProvider.System, factory.CreateLogger<SpecDirectorySync>());
            await File.WriteAllTextAsync(Path.Combine(folder, "typo-check.yaml"), DaemonTestData.Yaml("typo-check") + "\nchecks:\n  coeficients:\n    drift_impact_floor: 0.2\n");
            await File.WriteAllTextAsync(Path.Combine(folder, "typo-setting.yaml"), DaemonTestData.Yaml("typo-setting") + "\nchecks:\n  features:\n    drift_impact_floor: 0.2\n");

            Assert.False(await sync.SyncAsync(folder, CancellationToken.None));

            Assert.Null(await models.GetAsync("typo-check", CancellationToken.None));
            Assert.Null(await models.GetAsync("typo-setting", CancellationToken.None));
            Assert.Contains(logs.Records, r => r.Message.Contains("typo-check.yaml: checks.coeficients: unknown check 'coeficients'", StringComparison.Ordinal));
            Assert.Contains(logs.Records, r => r.Message.Contains("typo-setting.yaml: checks.features: 'drift_impact_floor' is a setting of the coefficients check", StringComparison.Ordinal));
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    [Fact]
    public async Task Retention_prunes_old_runs_and_their_findings_but_keeps_alerts()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "retained");
        await using var connection = await database.DataSource.OpenConnectionAsync();
        long oldRun = await connection.QuerySingleAsync<long>(
            "INSERT INTO modelwatch.run (model_key, slot, status, worker_id, started_at) VALUES ('retained', '2025-01-01Z', 'ok', 'w', '2025-01-01Z') RETURNING id");
        await connection.ExecuteAsync(
            "INSERT INTO modelwatch.finding (run_id, check_name, statistic, severity, explanation) VALUES (@oldRun, 'data', 'rows', 'ok', 'x')", new { oldRun });
        await connection.ExecuteAsync(
            "INSERT INTO modelwatch.alert (model_key, check_name, severity, state, opened_at, opened_by, first_run_id, last_run_id) VALUES ('retained', 'data', 'critical', 'open', '2025-01-01Z', 'w', @oldRun, @oldRun)", new { oldRun });
        long recentRun = await connection.QuerySingleAsync<long>(
            "INSERT INTO modelwatch.run (model_key, slot, status, worker_id, started_at) VALUES ('retained', @slot, 'ok', 'w', @slot) RETURNING id",
            new { slot = DaemonTestData.ReferenceEnd.AddDays(-1) });
        var retention = new RetentionService(database.DataSource, Microsoft.Extensions.Options.Options.Create(new RetentionOptions { RunMaxAge = TimeSpan.FromDays(180), BatchSize = 1 }), time, NullLogger<RetentionService>.Instance);

        long pruned = await retention.PruneAsync(CancellationToken.None);

        Assert.Equal(1, pruned);
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, $"SELECT count(*) FROM modelwatch.run WHERE id = {oldRun}"));
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource, $"SELECT count(*) FROM modelwatch.finding WHERE run_id = {oldRun}"));
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, $"SELECT count(*) FROM modelwatch.run WHERE id = {recentRun}"));
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.alert WHERE model_key = 'retained' AND first_run_id IS NULL"));
    }
}
