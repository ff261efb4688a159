using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Persistence;

/// <summary>Read access to run history for operators.</summary>
public sealed class RunQueries(NpgsqlDataSource state, TimeSpan commandTimeout)
{
    private const string RunColumns = """
        id AS Id, model_key AS Model, slot AS Slot, window_start AS WindowStart, window_end AS WindowEnd, status AS Status,
        reason AS Reason, baseline_version AS BaselineVersion, rows_read AS RowsRead, rows_rejected AS RowsRejected,
        worker_id AS Worker, started_at AS StartedAt, finished_at AS FinishedAt, stage_timings::text AS StageTimings
        """;

    /// <summary>The newest runs, optionally of one model.</summary>
    public async Task<IReadOnlyList<RunView>> ListAsync(string? model, int limit, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<RunView>(new CommandDefinition(
            $"""
            SELECT {RunColumns}
              FROM modelwatch.run
             WHERE (@model::text IS NULL OR model_key = @model)
             ORDER BY slot DESC, id DESC
             LIMIT @limit
            """,
            new { model, limit },
            commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds),
            cancellationToken: cancellationToken));
        return rows.ToList();
    }

    /// <summary>One run, or null when there is none with this id.</summary>
    public async Task<RunView?> GetAsync(long runId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleOrDefaultAsync<RunView>(new CommandDefinition(
            $"SELECT {RunColumns} FROM modelwatch.run WHERE id = @runId",
            new { runId },
            commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds),
            cancellationToken: cancellationToken));
    }

    /// <summary>The findings one run recorded, in the order it recorded them.</summary>
    public async Task<IReadOnlyList<FindingView>> FindingsAsync(long runId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<FindingView>(new CommandDefinition(
            $"SELECT {FindingView.Columns} FROM modelwatch.finding WHERE run_id = @runId ORDER BY id",
            new { runId },
            commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds),
            cancellationToken: cancellationToken));
        return rows.ToList();
    }
}
