using ModelWatch.Store.Local;

namespace ModelWatch.Cli.Demo;

/// <summary>
/// The database the demo runs on: the one given with <c>--database</c>, else a throwaway cluster from PostgreSQL
/// binaries on PATH or under /usr/lib/postgresql/*/bin, else the configured <c>ConnectionStrings:State</c>. The
/// production executable carries no container client: without local binaries, point the demo at a server you own.
/// Disposing it stops and removes what the demo started, unless it is kept.
/// </summary>
internal sealed class DemoDatabase : IAsyncDisposable
{
    private readonly ThrowawayCluster? _cluster;

    private DemoDatabase(string connectionString, string origin, ThrowawayCluster? cluster)
    {
        ConnectionString = connectionString;
        Origin = origin;
        _cluster = cluster;
    }

    public string ConnectionString { get; }

    public string Origin { get; }

    /// <summary>Whether the demo started this database itself (and so may stop it).</summary>
    public bool Started => _cluster is not null;

    /// <summary>Leave a started database running at dispose.</summary>
    public bool Keep { get; set; }

    /// <summary>The cluster the demo started, or null for a database it was given.</summary>
    public ThrowawayCluster? Cluster => _cluster;

    public static async Task<DemoDatabase> OpenAsync(string? connectionString, string? configured, CancellationToken cancellationToken)
    {
        if (!string.IsNullOrWhiteSpace(connectionString))
        {
            return new DemoDatabase(connectionString, "the database given with --database", null);
        }

        var problems = new List<string>();
        if (ThrowawayCluster.FindBinaries() is { } binaries)
        {
            try
            {
                ThrowawayCluster cluster = await ThrowawayCluster.StartAsync(binaries, cancellationToken);
                return new DemoDatabase(cluster.ConnectionString, $"a throwaway PostgreSQL cluster from {binaries}", cluster);
            }
            catch (Exception ex) when (ex is InvalidOperationException or System.ComponentModel.Win32Exception)
            {
                problems.Add($"the PostgreSQL binaries in {binaries} did not start a cluster ({ex.Message.Trim()})");
            }
        }
        else
        {
            problems.Add("no PostgreSQL server binaries (initdb, pg_ctl) on PATH or under /usr/lib/postgresql/*/bin");
        }

        if (!string.IsNullOrWhiteSpace(configured))
        {
            return new DemoDatabase(configured, "the database of ConnectionStrings:State", null);
        }

        throw new DemoException(
            "the demo needs a PostgreSQL server (15 or later) and found none: " + string.Join("; ", problems) + ". " +
            "Install the server (apt-get install postgresql), or point the demo at a database you own: " +
            "modelwatch demo --database \"Host=...;Username=...;Password=...;Database=...\" (or set ConnectionStrings__State). " +
            "The demo creates the schema courier_demo and the model courier-eta there.");
    }

    public async ValueTask DisposeAsync()
    {
        if (Keep)
        {
            return;
        }

        if (_cluster is not null)
        {
            await _cluster.DisposeAsync();
        }
    }
}
