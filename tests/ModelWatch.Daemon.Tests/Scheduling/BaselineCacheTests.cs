using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Execution;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Store.Baselines;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Scheduling;

public sealed class BaselineCacheTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task The_cache_stays_within_its_budget_and_drops_the_least_recently_used_baseline()
    {
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.PrepareAsync(database, hours: 2);
        foreach (string key in new[] { "cached-a", "cached-b", "cached-c" })
        {
            await DaemonTestData.RegisterAsync(database, time, key);
        }

        var repository = new BaselineRepository(database.DataSource, time, DaemonTestData.CommandTimeout);
        StoredBaseline a = (await repository.GetAsync("cached-a", 1, CancellationToken.None))!;
        long one = BaselineCache.EstimateBytes(a);

        // Room for two of the three (they are the same size: the same reference window).
        var cache = new BaselineCache(repository, (2 * one) + (one / 2));
        StoredBaseline first = (await cache.GetAsync("cached-a", 1, CancellationToken.None))!;
        await cache.GetAsync("cached-b", 1, CancellationToken.None);
        Assert.Same(first, await cache.GetAsync("cached-a", 1, CancellationToken.None));

        // b is now the least recently used: c takes its room, and a is still served from memory.
        await cache.GetAsync("cached-c", 1, CancellationToken.None);
        Assert.Equal(2, cache.Count);
        Assert.True(cache.EstimatedBytes <= (2 * one) + (one / 2));
        Assert.Same(first, await cache.GetAsync("cached-a", 1, CancellationToken.None));
        StoredBaseline again = (await cache.GetAsync("cached-b", 1, CancellationToken.None))!;
        Assert.Equal(1, again.Version);
        Assert.Equal(2, cache.Count);

        // A budget smaller than one baseline keeps nothing, yet every run still gets its baseline.
        var tiny = new BaselineCache(repository, one / 2);
        Assert.NotNull(await tiny.GetAsync("cached-a", 1, CancellationToken.None));
        Assert.Equal(0, tiny.Count);
    }
}
