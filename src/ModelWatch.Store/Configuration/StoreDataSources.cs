using Microsoft.Extensions.Configuration;
using Npgsql;

namespace ModelWatch.Store.Configuration;

/// <summary>
/// One <see cref="NpgsqlDataSource"/> per database, created on first use and shared: the state database and
/// each named data source. Disposing closes every pool.
/// </summary>
public sealed class StoreDataSources : IAsyncDisposable
{
    private const string StatePoolName = "modelwatch-state";
    private const string SourcePoolPrefix = "modelwatch-source-";
    private readonly IConfiguration _configuration;
    private readonly Dictionary<string, NpgsqlDataSource> _sources = new(StringComparer.Ordinal);
    private readonly Lock _gate = new();

    /// <summary>Creates the set for a configuration and an optional <c>--database</c> override.</summary>
    public StoreDataSources(IConfiguration configuration, string? databaseOption = null)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        _configuration = configuration;
        StateConnectionString = ConnectionSettings.ResolveState(configuration, databaseOption);
        State = Build(StateConnectionString, StatePoolName);
    }

    /// <summary>The state database.</summary>
    public NpgsqlDataSource State { get; }

    /// <summary>The state database's connection string.</summary>
    public string StateConnectionString { get; }

    /// <summary>The statement timeout configured for a data source (<c>Sources:&lt;name&gt;:StatementTimeout</c>), or null.</summary>
    /// <exception cref="StoreConfigurationException">The value is not a positive duration.</exception>
    public TimeSpan? StatementTimeout(string? name)
    {
        if (name is null || _configuration[$"Sources:{name}:StatementTimeout"] is not { Length: > 0 } text)
        {
            return null;
        }

        return TimeSpan.TryParse(text, System.Globalization.CultureInfo.InvariantCulture, out TimeSpan value) && value > TimeSpan.Zero
            ? value
            : throw new StoreConfigurationException($"Sources:{name}:StatementTimeout: '{text}' is not a positive duration such as 00:05:00");
    }

    /// <summary>Window-read limits with each source's own statement timeout.</summary>
    public Windows.WindowReadOptions ReadOptions() => new() { StatementTimeoutOf = StatementTimeout };

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
                source = Build(connectionString, SourcePoolPrefix + name);
                _sources.Add(name, source);
            }

            return source;
        }
    }

    /// <summary>Builds a data source whose pool name is <paramref name="name"/>, so telemetry never shows the connection string.</summary>
    /// <exception cref="StoreConfigurationException">The connection string does not parse (the message never repeats it: it may hold a password).</exception>
    public static NpgsqlDataSource Build(string connectionString, string name)
    {
        NpgsqlDataSourceBuilder builder;
        try
        {
            builder = new NpgsqlDataSourceBuilder(connectionString) { Name = name };
        }
        catch (ArgumentException ex)
        {
            throw new StoreConfigurationException($"{Setting(name)}: the connection string is not valid ({Reason(ex)}); write key=value pairs separated by ';', such as Host=db.internal;Username=reader;Password=...;Database=sales");
        }

        if (string.IsNullOrEmpty(builder.ConnectionStringBuilder.ApplicationName))
        {
            builder.ConnectionStringBuilder.ApplicationName = "modelwatch";
        }

        return builder.Build();
    }

    private static string Setting(string name) =>
        name == StatePoolName ? "ConnectionStrings:State (or --database)"
        : name.StartsWith(SourcePoolPrefix, StringComparison.Ordinal) ? $"Sources:{name[SourcePoolPrefix.Length..]}:ConnectionString"
        : name;

    private static string Reason(ArgumentException ex) => ex.InnerException switch
    {
        KeyNotFoundException => $"'{ex.ParamName}' is not a keyword Npgsql knows; check its spelling",
        FormatException => $"the value of '{ex.ParamName}' is not of the right kind",
        _ when ex.ParamName is null => "it is not a list of key=value pairs",
        _ => $"'{ex.ParamName}' cannot be set",
    };

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
