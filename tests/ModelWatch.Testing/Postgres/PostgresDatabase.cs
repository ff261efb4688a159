using Npgsql;
using Xunit;

namespace ModelWatch.Testing.Postgres;

/// <summary>
/// A fresh database per test class (use as <c>IClassFixture&lt;PostgresDatabase&gt;</c>), created on the shared
/// server and dropped with <c>WITH (FORCE)</c> afterwards, so test classes never see each other's data.
/// </summary>
public sealed class PostgresDatabase : IAsyncLifetime
{
    private NpgsqlDataSource? _dataSource;
    private PostgresServer? _server;

    /// <summary>The database name (unique per fixture).</summary>
    public string Name { get; } = "mw_test_" + Guid.NewGuid().ToString("N")[..16];

    /// <summary>Connection string to this database.</summary>
    public string ConnectionString { get; private set; } = string.Empty;

    /// <summary>The server this database lives on.</summary>
    public PostgresServer Server => _server ?? throw new InvalidOperationException("The fixture is not initialised.");

    /// <summary>A data source for this database.</summary>
    public NpgsqlDataSource DataSource => _dataSource ?? throw new InvalidOperationException("The fixture is not initialised.");

    /// <inheritdoc />
    public async Task InitializeAsync()
    {
        _server = await PostgresServer.GetAsync();
        await using (var admin = NpgsqlDataSource.Create(_server.ConnectionString))
        await using (var create = admin.CreateCommand($"CREATE DATABASE \"{Name}\""))
        {
            await create.ExecuteNonQueryAsync();
        }

        ConnectionString = new NpgsqlConnectionStringBuilder(_server.ConnectionString) { Database = Name }.ConnectionString;
        _dataSource = NpgsqlDataSource.Create(ConnectionString);
    }

    /// <inheritdoc />
    public async Task DisposeAsync()
    {
        if (_dataSource is not null)
        {
            await _dataSource.DisposeAsync();
        }

        if (_server is null)
        {
            return;
        }

        NpgsqlConnection.ClearAllPools();
        await using var admin = NpgsqlDataSource.Create(_server.ConnectionString);
        await using var drop = admin.CreateCommand($"DROP DATABASE IF EXISTS \"{Name}\" WITH (FORCE)");
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        await drop.ExecuteNonQueryAsync(timeout.Token);
    }
}
