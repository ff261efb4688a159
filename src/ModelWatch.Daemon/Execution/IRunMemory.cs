using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// What a run remembers from the runs before it: the checks' sequential states, the alert policy's states and the
/// end of the previous window. The daemon keeps it in the state database (<see cref="Persistence.RunRecorder"/>);
/// a backtest or a one-off check keeps it in memory, so both go through the same pipeline.
/// </summary>
public interface IRunMemory
{
    /// <summary>The persisted check states (by check name) and alert policy states of a model.</summary>
    Task<(Dictionary<string, CheckState> Checks, List<AlertPolicyState> Policy)> LoadStatesAsync(string modelKey, CancellationToken cancellationToken);

    /// <summary>End of the window of the model's latest run that read rows, or null before the first.</summary>
    Task<DateTimeOffset?> LastWindowEndAsync(string modelKey, CancellationToken cancellationToken);
}
