namespace ModelWatch.Daemon.Runs;

/// <summary>
/// What a run remembers from the runs before it: the checks' sequential states, the alert policy's states and the
/// end of the previous window. The daemon keeps it in the state database (<see cref="Persistence.RunRecorder"/>);
/// a backtest or a one-off check keeps it in memory, so both go through the same pipeline.
/// </summary>
public interface IRunMemory
{
    /// <summary>Everything a run of the model takes over from earlier runs, in one read.</summary>
    Task<RunRecollection> RecallAsync(string modelKey, CancellationToken cancellationToken);
}
