using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Store.Tests.Models;

public sealed class ModelRepositoryTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private ModelRepository Repository => new(database.DataSource, TimeProvider.System, StoreTestData.CommandTimeout);

    public Task InitializeAsync() => StoreTestData.MigrateAsync(database);

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public async Task Apply_creates_then_reports_unchanged_then_updated()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("repo-cycle"));
        ModelSpec changed = StoreTestData.Spec(StoreTestData.Yaml("repo-cycle", extra: "missing: fail"));

        var created = await Repository.ApplyAsync([(spec, "/specs/repo-cycle.yaml")], false, CancellationToken.None);
        var same = await Repository.ApplyAsync([(spec, "/specs/repo-cycle.yaml")], false, CancellationToken.None);
        var updated = await Repository.ApplyAsync([(changed, "/specs/repo-cycle.yaml")], false, CancellationToken.None);

        Assert.Equal(ApplyAction.Created, Assert.Single(created).Action);
        Assert.Contains("no baseline yet", created[0].BaselineNote, StringComparison.Ordinal);
        Assert.Equal(ApplyAction.Unchanged, Assert.Single(same).Action);
        Assert.Equal(ApplyAction.Updated, Assert.Single(updated).Action);
        ModelRecord stored = (await Repository.GetAsync("repo-cycle", CancellationToken.None))!;
        Assert.Equal(MissingValuePolicy.Fail, stored.Spec.Missing);
        Assert.Equal("/specs/repo-cycle.yaml", stored.SourceFile);
        Assert.True(stored.Enabled);
        Assert.NotNull(stored.NextDueSlot);
        Assert.Equal(TimeSpan.Zero, stored.NextDueSlot!.Value.Offset);
    }

    [Fact]
    public async Task Prune_disables_models_whose_files_are_gone_and_keeps_their_rows()
    {
        await Repository.ApplyAsync([(StoreTestData.Spec(StoreTestData.Yaml("prune-keep")), null), (StoreTestData.Spec(StoreTestData.Yaml("prune-gone")), null)], false, CancellationToken.None);

        var outcomes = await Repository.ApplyAsync([(StoreTestData.Spec(StoreTestData.Yaml("prune-keep")), null)], true, CancellationToken.None);

        Assert.Contains(outcomes, o => o.Key == "prune-gone" && o.Action == ApplyAction.Disabled);
        Assert.False((await Repository.GetAsync("prune-gone", CancellationToken.None))!.Enabled);
        Assert.True((await Repository.GetAsync("prune-keep", CancellationToken.None))!.Enabled);

        var back = await Repository.ApplyAsync([(StoreTestData.Spec(StoreTestData.Yaml("prune-gone")), null)], false, CancellationToken.None);
        Assert.Equal(ApplyAction.Updated, Assert.Single(back).Action);
        Assert.True((await Repository.GetAsync("prune-gone", CancellationToken.None))!.Enabled);
    }

    [Fact]
    public async Task List_returns_models_by_key_and_get_returns_null_for_an_unknown_key()
    {
        await Repository.ApplyAsync([(StoreTestData.Spec(StoreTestData.Yaml("list-b")), null), (StoreTestData.Spec(StoreTestData.Yaml("list-a")), null)], false, CancellationToken.None);

        IReadOnlyList<ModelRecord> models = await Repository.ListAsync(CancellationToken.None);

        var keys = models.Select(m => m.Key).Where(k => k.StartsWith("list-", StringComparison.Ordinal)).ToList();
        Assert.Equal(["list-a", "list-b"], keys);
        Assert.Null(await Repository.GetAsync("no-such-model", CancellationToken.None));
    }

    [Fact]
    public async Task An_invalid_file_in_a_folder_writes_nothing_and_lists_every_problem()
    {
        string dir = Directory.CreateTempSubdirectory("mw-specs-").FullName;
        try
        {
            await File.WriteAllTextAsync(Path.Combine(dir, "a.yaml"), StoreTestData.Yaml("folder-good"));
            await File.WriteAllTextAsync(Path.Combine(dir, "b.yaml"), StoreTestData.Yaml("folder-bad").Replace("window: 1d", "window: -1d", StringComparison.Ordinal).Replace("schedule: 1h", "schedule: hourly", StringComparison.Ordinal));
            await File.WriteAllTextAsync(Path.Combine(dir, "c.yml"), StoreTestData.Yaml("folder-good"));

            var ex = Assert.Throws<ModelSpecException>(() => ModelSpecFiles.Load(dir));

            Assert.Equal(3, ex.Problems.Count);
            Assert.Contains(ex.Problems, p => p.File.EndsWith("b.yaml", StringComparison.Ordinal) && p.FieldPath == "window" && p.Message.Contains("positive duration", StringComparison.Ordinal));
            Assert.Contains(ex.Problems, p => p.File.EndsWith("b.yaml", StringComparison.Ordinal) && p.FieldPath == "schedule");
            Assert.Contains(ex.Problems, p => p.File.EndsWith("c.yml", StringComparison.Ordinal) && p.FieldPath == "key" && p.Message.Contains("also the key of", StringComparison.Ordinal));
            Assert.Null(await Repository.GetAsync("folder-good", CancellationToken.None));
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
        }
    }
}
