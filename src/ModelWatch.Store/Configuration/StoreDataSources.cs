using Microsoft.Extensions.Configuration;
using Npgsql;

namespace ModelWatch.Store.Configuration;

/// <summary>
/// One <see cref="NpgsqlDataSource"/> per database, created on first use and shared: the state database and
/// each named data source. Disposing closes every pool.
/// </summary>
public sealed class StoreDataSources : IAsyncDisposable
{
    private readonly IConfiguration _configuration;
    private readonly Dictionary<string, NpgsqlDataSource> _sources = new(StringComparer.Ordinal);
    private readonly Lock _gate = new();

    /// <summary>Creates the set for a configuration and an optional <c>--database</c> override.</summary>
    public StoreDataSources(IConfiguration configuration, string? databaseOption = null)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        _configuration = configuration;
        StateConnectionString = ConnectionSettings.ResolveState(configuration, databaseOption);
        State = Build(StateConnectionString, "modelwatch-state");
    }

    /// <summary>The state database.</summary>
    public NpgsqlDataSource State { get; }

    /// <summary>The state database's connection string.</summary>
    public string StateConnectionString { get; }

    /// <summary>The data source a spec reads from: the named source, or the state database when the name is null.</summary>
    public NpgsqlDataSource Source(string? name)
    {
        if (name is null)
        {
            return State;
        }

        lock (_gate)
        {
            if (!_sources.TryGetValue(name, out NpgsqlDataSource? source))
            {
                string connectionString = ConnectionSettings.ResolveSource(_configuration, name, StateConnectionString);
                source = Build(connectionString, "modelwatch-source-" + name);
                _sources.Add(name, source);
            }

            return source;
        }
    }

    /// <summary>Builds a data source whose pool name is <paramref name="name"/>, so telemetry never shows the connection string.</summary>
    public static NpgsqlDataSource Build(string connectionString, string name)
    {
        var builder = new NpgsqlDataSourceBuilder(connectionString) { Name = name };
        if (string.IsNullOrEmpty(builder.ConnectionStringBuilder.ApplicationName))
        {
            builder.ConnectionStringBuilder.ApplicationName = "modelwatch";
        }

        return builder.Build();
    }

    /// <inheritdoc />
    public async ValueTask DisposeAsync()
    {
        NpgsqlDataSource[] sources;
        lock (_gate)
        {
            sources = [.. _sources.Values];
            _sources.Clear();
        }

        foreach (NpgsqlDataSource source in sources)
        {
            await source.DisposeAsync();
        }

        await State.DisposeAsync();
    }
}
