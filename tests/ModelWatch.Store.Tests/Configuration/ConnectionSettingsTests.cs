using Microsoft.Extensions.Configuration;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Store.Tests.Configuration;

public sealed class ConnectionSettingsTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public void Appsettings_json_names_the_state_database_and_the_sources_and_the_option_wins()
    {
        string dir = Directory.CreateTempSubdirectory("mw-settings-").FullName;
        try
        {
            File.WriteAllText(Path.Combine(dir, "appsettings.json"), """
                { "ConnectionStrings": { "State": "Host=state.example;Database=mw" },
                  "Sources": { "shop": { "ConnectionString": "Host=shop.example;Database=sales" } } }
                """);

            IConfiguration configuration = ConnectionSettings.Load(dir);

            Assert.Equal("Host=state.example;Database=mw", ConnectionSettings.ResolveState(configuration, null));
            Assert.Equal("Host=other", ConnectionSettings.ResolveState(configuration, "Host=other"));
            Assert.Equal("Host=shop.example;Database=sales", ConnectionSettings.ResolveSource(configuration, "shop", "Host=state"));
            Assert.Equal("Host=state", ConnectionSettings.ResolveSource(configuration, null, "Host=state"));
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void Missing_connection_strings_name_the_key_and_the_environment_variable()
    {
        IConfiguration empty = new ConfigurationBuilder().Build();

        var state = Assert.Throws<StoreConfigurationException>(() => ConnectionSettings.ResolveState(empty, null));
        var source = Assert.Throws<StoreConfigurationException>(() => ConnectionSettings.ResolveSource(empty, "warehouse", "Host=state"));

        Assert.Contains("ConnectionStrings__State", state.Message, StringComparison.Ordinal);
        Assert.Contains("data source 'warehouse' is not configured: set Sources:warehouse:ConnectionString (environment variable Sources__warehouse__ConnectionString)", source.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_spec_reads_from_its_named_source_and_the_baseline_lands_in_the_state_database()
    {
        await StoreTestData.MigrateAsync(database);
        await using ScratchDatabase shop = await ScratchDatabase.CreateAsync(database.Server);
        await StoreTestData.CreateDeliveriesAsync(shop.DataSource, 200, "parcels");
        await StoreTestData.ApplyAsync(database, StoreTestData.Yaml(
            "from-shop", "SELECT * FROM parcels WHERE at >= @window_start AND at < @window_end", extra: "source: shop"));
        IConfiguration configuration = new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            [ConnectionSettings.StateKey] = database.ConnectionString,
            ["Sources:shop:ConnectionString"] = new Npgsql.NpgsqlConnectionStringBuilder(database.ConnectionString) { Database = shop.Name }.ConnectionString,
        }).Build();
        await using var databases = new StoreDataSources(configuration);

        StoredBaseline stored = await new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout)
            .FitAsync("from-shop", StoreTestData.Start, StoreTestData.Start.AddMinutes(200), "tester", CancellationToken.None);

        Assert.Equal(200, stored.Reference.RowCount);
        Assert.Equal(0, await StoreTestData.CountAsync(database.DataSource, "SELECT count(*) FROM pg_tables WHERE tablename = 'parcels'"));
        Assert.Equal(0, await StoreTestData.CountAsync(shop.DataSource, "SELECT count(*) FROM pg_namespace WHERE nspname = 'modelwatch'"));
        Assert.Same(databases.Source("shop"), databases.Source("shop"));
    }
}
