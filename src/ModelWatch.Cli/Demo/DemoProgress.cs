using ModelWatch.Daemon.Persistence;
using Npgsql;

namespace ModelWatch.Cli.Demo;

/// <summary>Reads what the daemon has done so far for the demo's model, through the daemon's own queries.</summary>
internal sealed class DemoProgress(NpgsqlDataSource state)
{
    private readonly ModelActivityQueries _queries = new(state, TimeSpan.FromSeconds(30));

    public Task<RunTally> RunsAsync(CancellationToken cancellationToken) =>
        _queries.RunTallyAsync(DemoScenario.ModelKey, cancellationToken);

    public Task<IReadOnlyList<ModelAlertEvent>> TransitionsAfterAsync(long eventId, CancellationToken cancellationToken) =>
        _queries.AlertHistoryAfterAsync(DemoScenario.ModelKey, eventId, cancellationToken);

    /// <summary>Models other than the demo's that the daemon would run too; the demo refuses to run beside them.</summary>
    public Task<IReadOnlyList<string>> OtherModelsAsync(CancellationToken cancellationToken) =>
        _queries.OtherEnabledModelsAsync(DemoScenario.ModelKey, cancellationToken);

    /// <summary>Whether an earlier demo already left runs in this database.</summary>
    public Task<bool> HasEarlierRunsAsync(CancellationToken cancellationToken) =>
        _queries.HasRunsAsync(DemoScenario.ModelKey, cancellationToken);
}
