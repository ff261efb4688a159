using Dapper;
using Npgsql;

namespace ModelWatch.Cli.Demo;

/// <summary>Reads what the daemon has done so far: its runs by status and the alert transitions after a given one.</summary>
internal sealed class DemoProgress(NpgsqlDataSource state)
{
    private const int Seconds = 30;

    public async Task<RunTally> RunsAsync(CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleAsync<RunTally>(new CommandDefinition(
            """
            SELECT count(*) FILTER (WHERE status = 'ok')::int AS Ok,
                   count(*) FILTER (WHERE status = 'skipped')::int AS Skipped,
                   count(*) FILTER (WHERE status = 'failed')::int AS Failed
              FROM modelwatch.run WHERE model_key = @model AND status <> 'running'
            """,
            new { model = DemoScenario.ModelKey },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }

    public async Task<IReadOnlyList<AlertTransition>> TransitionsAfterAsync(long eventId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<AlertTransition>(new CommandDefinition(
            """
            SELECT e.id AS EventId, e.alert_id AS AlertId, e.transition AS Transition, e.severity AS Severity,
                   a.check_name AS "Check", a.subject AS Subject, e.at AS At, e.explanation AS Explanation
              FROM modelwatch.alert_event e JOIN modelwatch.alert a ON a.id = e.alert_id
             WHERE a.model_key = @model AND e.id > @eventId
             ORDER BY e.id
            """,
            new { model = DemoScenario.ModelKey, eventId },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return rows.ToList();
    }

    /// <summary>Models other than the demo's that the daemon would run too; the demo refuses to run beside them.</summary>
    public async Task<IReadOnlyList<string>> OtherModelsAsync(CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var keys = await connection.QueryAsync<string>(new CommandDefinition(
            "SELECT key FROM modelwatch.model WHERE enabled AND key <> @model ORDER BY key",
            new { model = DemoScenario.ModelKey },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return keys.ToList();
    }

    /// <summary>Whether an earlier demo already left runs in this database.</summary>
    public async Task<bool> HasEarlierRunsAsync(CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.ExecuteScalarAsync<bool>(new CommandDefinition(
            "SELECT EXISTS (SELECT 1 FROM modelwatch.run WHERE model_key = @model)",
            new { model = DemoScenario.ModelKey },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }
}
