using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Daemon.Runs;

/// <summary>
/// Run memory held in process: a backtest carries the sequential and alert-policy states from window to window
/// exactly as the daemon would, without touching the state database. Start it empty, or seeded from the database
/// for a one-off check that should continue from live state.
/// </summary>
public sealed class InMemoryRunMemory : IRunMemory
{
    private readonly Dictionary<string, CheckState> _checks = new(StringComparer.Ordinal);
    private readonly Dictionary<(string Check, string Subject), AlertPolicyState> _policy = [];
    private DateTimeOffset? _lastWindowEnd;

    /// <summary>Creates an empty memory, optionally seeded.</summary>
    public InMemoryRunMemory(IReadOnlyDictionary<string, CheckState>? checks = null, IEnumerable<AlertPolicyState>? policy = null, DateTimeOffset? lastWindowEnd = null)
    {
        foreach ((string check, CheckState state) in checks ?? new Dictionary<string, CheckState>())
        {
            _checks[check] = state;
        }

        foreach (AlertPolicyState state in policy ?? [])
        {
            _policy[(state.Check, state.Subject ?? string.Empty)] = state;
        }

        _lastWindowEnd = lastWindowEnd;
    }

    /// <inheritdoc />
    public Task<RunRecollection> RecallAsync(string modelKey, CancellationToken cancellationToken) =>
        Task.FromResult(new RunRecollection(new Dictionary<string, CheckState>(_checks, StringComparer.Ordinal), [.. _policy.Values], _lastWindowEnd));

    /// <summary>Carries a finished run's states forward, as recording it in the database would.</summary>
    public void Remember(RunOutcome outcome)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        foreach (CheckResult result in outcome.Results)
        {
            _checks[result.Check] = result.State;
        }

        foreach (AlertDecision decision in outcome.Decisions)
        {
            _policy[(decision.Check, decision.Subject ?? string.Empty)] = decision.State;
        }

        if (outcome.RowsRead > 0 && outcome.WindowEnd is { } end && (_lastWindowEnd is null || end > _lastWindowEnd))
        {
            _lastWindowEnd = end;
        }
    }
}
