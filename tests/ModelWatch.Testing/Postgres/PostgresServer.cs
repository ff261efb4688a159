using ModelWatch.Store.Local;
using Npgsql;
using Testcontainers.PostgreSql;

namespace ModelWatch.Testing.Postgres;

/// <summary>
/// The PostgreSQL server shared by a test process, found once: the connection string in
/// <c>MODELWATCH_TEST_POSTGRES</c> when set; else a Testcontainers container when a Docker engine answers;
/// else a throwaway cluster from PostgreSQL binaries on PATH or under /usr/lib/postgresql/*/bin.
/// </summary>
public sealed class PostgresServer
{
    /// <summary>The environment variable that points the tests at an existing server.</summary>
    public const string EnvironmentVariable = "MODELWATCH_TEST_POSTGRES";

    private static readonly SemaphoreSlim Gate = new(1, 1);
    private static PostgresServer? _shared;

    private PostgresServer(string connectionString, string origin)
    {
        ConnectionString = connectionString;
        Origin = origin;
    }

    /// <summary>Superuser connection string to the server's maintenance database.</summary>
    public string ConnectionString { get; }

    /// <summary>Where the server came from (for diagnostics).</summary>
    public string Origin { get; }

    /// <summary>Returns the process-wide server, starting one on first use (at most 3 minutes).</summary>
    public static async Task<PostgresServer> GetAsync()
    {
        await Gate.WaitAsync();
        try
        {
            using var timeout = new CancellationTokenSource(TimeSpan.FromMinutes(3));
            return _shared ??= await FindAsync(timeout.Token);
        }
        finally
        {
            Gate.Release();
        }
    }

    private static async Task<PostgresServer> FindAsync(CancellationToken cancellationToken)
    {
        string? configured = Environment.GetEnvironmentVariable(EnvironmentVariable);
        if (!string.IsNullOrWhiteSpace(configured))
        {
            return new PostgresServer(configured, EnvironmentVariable);
        }

        var problems = new List<string> { $"{EnvironmentVariable} is not set" };
        if (DockerEngine.MayAnswer())
        {
            try
            {
                PostgreSqlContainer container = new PostgreSqlBuilder("postgres:15-alpine").Build();
                await container.StartAsync(cancellationToken);
                AppDomain.CurrentDomain.ProcessExit += (_, _) => container.DisposeAsync().AsTask().GetAwaiter().GetResult();
                return new PostgresServer(container.GetConnectionString(), "Testcontainers");
            }
            catch (Exception ex) when (ex is not OperationCanceledException)
            {
                problems.Add($"Docker did not start a container ({ex.GetType().Name}: {ex.Message})");
            }
        }
        else
        {
            problems.Add("no Docker engine answers");
        }

        string? binaries = ThrowawayCluster.FindBinaries();
        if (binaries is not null)
        {
            ThrowawayCluster cluster = await ThrowawayCluster.StartAsync(binaries, cancellationToken);
            AppDomain.CurrentDomain.ProcessExit += (_, _) => cluster.StopNow();
            return new PostgresServer(cluster.ConnectionString, $"throwaway cluster from {binaries}");
        }

        problems.Add("no PostgreSQL binaries (initdb, pg_ctl) on PATH or under /usr/lib/postgresql/*/bin");
        throw new InvalidOperationException(
            "No PostgreSQL server for the tests: " + string.Join("; ", problems) + ". " +
            $"Set {EnvironmentVariable} to a superuser connection string (e.g. Host=127.0.0.1;Port=5432;Username=postgres), " +
            "start a Docker engine, or install the PostgreSQL server (apt-get install postgresql).");
    }

    /// <summary>Opens a data source on a database of this server.</summary>
    public NpgsqlDataSource OpenDataSource(string database) =>
        NpgsqlDataSource.Create(new NpgsqlConnectionStringBuilder(ConnectionString) { Database = database }.ConnectionString);
}
