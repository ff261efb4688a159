using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Persistence;

/// <summary>
/// What a one-off recorded run (<c>modelwatch check --record</c>) needs from the state database besides the
/// <see cref="RunRecorder"/>: a claim of one named model's lease, whoever's schedule says it is due, and the newest
/// slot recorded for it, so that a person never records a slot behind the model's recorded history.
/// </summary>
public sealed class ManualRunRepository(NpgsqlDataSource state, TimeSpan commandTimeout)
{
    private const string ClaimSql = """
        UPDATE modelwatch.model
           SET lease_owner = @worker, lease_expires_at = @expires
         WHERE key = @key
           AND (lease_owner IS NULL OR lease_owner = @worker OR lease_expires_at IS NULL OR lease_expires_at <= @now)
        RETURNING next_due_slot
        """;

    /// <summary>Claims the lease of model <paramref name="key"/> for <paramref name="lease"/> unless another worker holds it.</summary>
    public async Task<ManualClaim> ClaimAsync(string key, string worker, DateTimeOffset now, TimeSpan lease, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var claimed = (await connection.QueryAsync<DateTime?>(Command(ClaimSql, new { key, worker, now, expires = now + lease }, cancellationToken))).ToList();
        if (claimed.Count > 0)
        {
            return new ManualClaim(true, Utc(claimed[0]), null, null);
        }

        var holder = await connection.QuerySingleOrDefaultAsync<(string? Owner, DateTime? Until)>(Command(
            "SELECT lease_owner, lease_expires_at FROM modelwatch.model WHERE key = @key", new { key }, cancellationToken));
        return new ManualClaim(false, null, holder.Owner, Utc(holder.Until));
    }

    /// <summary>The newest slot with a recorded run of the model, or null when none is recorded.</summary>
    public async Task<DateTimeOffset?> NewestRecordedSlotAsync(string key, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return Utc(await connection.ExecuteScalarAsync<DateTime?>(Command(
            "SELECT max(slot) FROM modelwatch.run WHERE model_key = @key", new { key }, cancellationToken)));
    }

    private static DateTimeOffset? Utc(DateTime? time) => time is { } t ? new DateTimeOffset(DateTime.SpecifyKind(t, DateTimeKind.Utc)) : null;

    private CommandDefinition Command(string sql, object parameters, CancellationToken cancellationToken) =>
        new(sql, parameters, commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds), cancellationToken: cancellationToken);
}
