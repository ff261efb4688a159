namespace ModelWatch.Daemon.Health;

/// <summary>
/// What the health endpoint reports, updated by the scheduling loop: when it last finished a cycle, and whether
/// the state database answered with its migrations current. Thread-safe.
/// </summary>
public sealed class DaemonHealth(TimeProvider time)
{
    private long _lastCycleTicks = time.GetUtcNow().UtcTicks;
    private volatile bool _databaseReady;
    private volatile string _databaseProblem = "not checked yet";

    /// <summary>When the loop last completed a cycle.</summary>
    public DateTimeOffset LastCycle => new(Interlocked.Read(ref _lastCycleTicks), TimeSpan.Zero);

    /// <summary>Whether the state database is reachable and migrated.</summary>
    public bool DatabaseReady => _databaseReady;

    /// <summary>Why the database is not ready (empty when it is).</summary>
    public string DatabaseProblem => _databaseProblem;

    /// <summary>Marks a completed loop cycle.</summary>
    public void CycleCompleted() => Interlocked.Exchange(ref _lastCycleTicks, time.GetUtcNow().UtcTicks);

    /// <summary>Records that the database answered and its schema is current.</summary>
    public void DatabaseAvailable()
    {
        _databaseReady = true;
        _databaseProblem = string.Empty;
    }

    /// <summary>Records that the database could not be used, and why.</summary>
    public void DatabaseUnavailable(string problem)
    {
        _databaseReady = false;
        _databaseProblem = problem;
    }

    /// <summary>Whether the loop is alive: it completed a cycle within <paramref name="allowance"/>.</summary>
    public bool IsAlive(TimeSpan allowance) => time.GetUtcNow() - LastCycle <= allowance;
}
