using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Store.Tests.Support;

/// <summary>An extra empty database on the shared server, for tests that need a database of their own (dropped afterwards).</summary>
internal sealed class ScratchDatabase : IAsyncDisposable
{
    private ScratchDatabase(PostgresServer server, string name)
    {
        Server = server;
        Name = name;
        DataSource = server.OpenDataSource(name);
    }

    public PostgresServer Server { get; }

    public string Name { get; }

    public NpgsqlDataSource DataSource { get; }

    public static async Task<ScratchDatabase> CreateAsync(PostgresServer server)
    {
        string name = "mw_scratch_" + Guid.NewGuid().ToString("N")[..16];
        await using NpgsqlDataSource admin = NpgsqlDataSource.Create(server.ConnectionString);
        await using NpgsqlCommand create = admin.CreateCommand($"CREATE DATABASE \"{name}\"");
        await create.ExecuteNonQueryAsync();
        return new ScratchDatabase(server, name);
    }

    public async ValueTask DisposeAsync()
    {
        await DataSource.DisposeAsync();
        await using NpgsqlDataSource admin = NpgsqlDataSource.Create(Server.ConnectionString);
        await using NpgsqlCommand drop = admin.CreateCommand($"DROP DATABASE IF EXISTS \"{Name}\" WITH (FORCE)");
        await drop.ExecuteNonQueryAsync();
    }
}
