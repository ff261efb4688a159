using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Persistence;

/// <summary>
/// Claims due models with a time-limited lease (<c>FOR UPDATE SKIP LOCKED</c>), so replicas share the work without
/// holding a connection or a lock across a run. The current time is always a parameter from the daemon's
/// <see cref="TimeProvider"/>, never the database's <c>now()</c>, so fake clocks and the demo's fast clock work.
/// </summary>
public sealed class LeaseRepository(NpgsqlDataSource state, TimeSpan commandTimeout)
{
    private const string ClaimSql = """
        UPDATE modelwatch.model AS m
           SET lease_owner = @worker, lease_expires_at = @expires
          FROM (SELECT key
                  FROM modelwatch.model
                 WHERE enabled
                   AND next_due_slot IS NOT NULL
                   AND next_due_slot <= @now
                   AND (lease_expires_at IS NULL OR lease_expires_at <= @now)
                 ORDER BY next_due_slot, key
                 LIMIT @limit
                   FOR UPDATE SKIP LOCKED) AS due
         WHERE m.key = due.key
        RETURNING m.key AS Key, m.next_due_slot AS DueSlot
        """;

    /// <summary>Claims up to <paramref name="limit"/> due models for <paramref name="lease"/>.</summary>
    public async Task<IReadOnlyList<ClaimedModel>> ClaimDueAsync(string worker, DateTimeOffset now, TimeSpan lease, int limit, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<ClaimedModel>(new CommandDefinition(
            ClaimSql,
            new { worker, now, expires = now + lease, limit },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return rows.ToList();
    }

    /// <summary>
    /// Extends this worker's live lease on a model to <paramref name="now"/> + <paramref name="lease"/> while its run is
    /// in progress; false when the lease is no longer this worker's (it expired and another replica took the model).
    /// </summary>
    public async Task<bool> RenewAsync(string worker, string key, DateTimeOffset now, TimeSpan lease, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        int renewed = await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE modelwatch.model SET lease_expires_at = @expires WHERE key = @key AND lease_owner = @worker AND lease_expires_at > @now",
            new { worker, key, now, expires = now + lease },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return renewed > 0;
    }

    /// <summary>Releases this worker's leases (on shutdown), so another replica can take the models at once.</summary>
    public async Task<int> ReleaseAllAsync(string worker, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE modelwatch.model SET lease_owner = NULL, lease_expires_at = NULL WHERE lease_owner = @worker",
            new { worker },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }

    /// <summary>Releases this worker's lease on one model.</summary>
    public async Task ReleaseAsync(string worker, string key, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE modelwatch.model SET lease_owner = NULL, lease_expires_at = NULL WHERE key = @key AND lease_owner = @worker",
            new { worker, key },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }

    /// <summary>Sets the first due slot of models that have none (new models, or models whose schedule changed).</summary>
    public async Task<IReadOnlyList<(string Key, string Schedule)>> UnscheduledAsync(CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<(string, string)>(new CommandDefinition(
            "SELECT key, schedule FROM modelwatch.model WHERE enabled AND next_due_slot IS NULL",
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return rows.ToList();
    }

    /// <summary>Schedules a model's first slot unless another replica did so meanwhile.</summary>
    public async Task ScheduleAsync(string key, DateTimeOffset dueSlot, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE modelwatch.model SET next_due_slot = @dueSlot WHERE key = @key AND next_due_slot IS NULL",
            new { key, dueSlot },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }

    private int Seconds => (int)Math.Ceiling(commandTimeout.TotalSeconds);
}
