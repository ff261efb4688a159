using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Persistence;

/// <summary>
/// What the daemon has done for one model so far, read while it works: finished runs by status and the alert
/// transitions after a given event; and whether a database already serves other models or earlier runs of this one.
/// </summary>
public sealed class ModelActivityQueries(NpgsqlDataSource state, TimeSpan commandTimeout)
{
    /// <summary>The model's finished runs (not those still running) by status.</summary>
    public async Task<RunTally> RunTallyAsync(string model, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleAsync<RunTally>(Command(
            """
            SELECT count(*) FILTER (WHERE status = 'ok')::int AS Ok,
                   count(*) FILTER (WHERE status = 'skipped')::int AS Skipped,
                   count(*) FILTER (WHERE status = 'failed')::int AS Failed
              FROM modelwatch.run WHERE model_key = @model AND status <> 'running'
            """,
            new { model },
            cancellationToken));
    }

    /// <summary>The model's alert transitions recorded after event <paramref name="eventId"/>, oldest first.</summary>
    public async Task<IReadOnlyList<ModelAlertEvent>> AlertHistoryAfterAsync(string model, long eventId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<ModelAlertEvent>(Command(
            """
            SELECT e.id AS EventId, e.alert_id AS AlertId, a.previous_alert_id AS PreviousAlertId, e.transition AS Transition,
                   e.severity AS Severity, a.check_name AS "Check", a.subject AS Subject, e.at AS At, e.explanation AS Explanation
              FROM modelwatch.alert_event e JOIN modelwatch.alert a ON a.id = e.alert_id
             WHERE a.model_key = @model AND e.id > @eventId
             ORDER BY e.id
            """,
            new { model, eventId },
            cancellationToken));
        return rows.ToList();
    }

    /// <summary>Enabled models other than <paramref name="model"/>, by key.</summary>
    public async Task<IReadOnlyList<string>> OtherEnabledModelsAsync(string model, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var keys = await connection.QueryAsync<string>(Command(
            "SELECT key FROM modelwatch.model WHERE enabled AND key <> @model ORDER BY key", new { model }, cancellationToken));
        return keys.ToList();
    }

    /// <summary>Whether any run of the model is recorded.</summary>
    public async Task<bool> HasRunsAsync(string model, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.ExecuteScalarAsync<bool>(Command(
            "SELECT EXISTS (SELECT 1 FROM modelwatch.run WHERE model_key = @model)", new { model }, cancellationToken));
    }

    private CommandDefinition Command(string sql, object parameters, CancellationToken cancellationToken) =>
        new(sql, parameters, commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds), cancellationToken: cancellationToken);
}
