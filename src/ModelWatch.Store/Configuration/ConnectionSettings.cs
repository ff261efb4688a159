using Microsoft.Extensions.Configuration;

namespace ModelWatch.Store.Configuration;

/// <summary>
/// Where the databases are: the state database under <c>ConnectionStrings:State</c> (environment variable
/// <c>ConnectionStrings__State</c>, or <c>appsettings.json</c>), overridable by a command's <c>--database</c>;
/// data sources under <c>Sources:&lt;name&gt;:ConnectionString</c>. A spec without a source reads from the state database.
/// </summary>
public static class ConnectionSettings
{
    /// <summary>Configuration key of the state database's connection string.</summary>
    public const string StateKey = "ConnectionStrings:State";

    /// <summary>The sections the store reads, with the class their entries bind to, for <see cref="UnknownSettings"/>.</summary>
    public static IReadOnlyDictionary<string, Type> AuditedSections { get; } = new Dictionary<string, Type>(StringComparer.Ordinal)
    {
        ["Sources"] = typeof(Dictionary<string, SourceSettings>),
    };

    /// <summary>The layered configuration of a command (see <see cref="ConfigurationLayers"/>).</summary>
    public static IConfiguration Load(string? directory = null) => ConfigurationLayers.Load(directory);

    /// <summary>The state database's connection string: <paramref name="databaseOption"/> when given, else configuration.</summary>
    public static string ResolveState(IConfiguration configuration, string? databaseOption)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        if (!string.IsNullOrWhiteSpace(databaseOption))
        {
            return databaseOption;
        }

        string? configured = configuration[StateKey];
        return string.IsNullOrWhiteSpace(configured)
            ? throw new StoreConfigurationException($"no state database: pass --database or set {StateKey} (environment variable ConnectionStrings__State, or appsettings.json)")
            : configured;
    }

    /// <summary>The connection string of the named data source, or the state database's when <paramref name="sourceName"/> is null.</summary>
    public static string ResolveSource(IConfiguration configuration, string? sourceName, string stateConnectionString)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        if (sourceName is null)
        {
            return stateConnectionString;
        }

        string key = $"Sources:{sourceName}:ConnectionString";
        string? configured = configuration[key];
        return string.IsNullOrWhiteSpace(configured)
            ? throw new StoreConfigurationException($"data source '{sourceName}' is not configured: set {key} (environment variable Sources__{sourceName}__ConnectionString)")
            : configured;
    }
}
