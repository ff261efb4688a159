using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// Quiet periods in the state database: set, list, end. The notification dispatcher reads them when it delivers;
/// nothing here touches runs or alerts.
/// </summary>
public sealed class QuietPeriodRepository(NpgsqlDataSource dataSource, TimeSpan commandTimeout)
{
    private const string SelectSql = """
        SELECT q.id AS Id, q.model_key AS Model, q.check_name AS "Check", q.until AS Until, q.reason AS Reason,
               q.created_by AS CreatedBy, q.created_at AS CreatedAt, q.ended_at AS EndedAt, q.ended_by AS EndedBy,
               (SELECT count(*) FROM modelwatch.notification n
                 WHERE n.state = 'held' AND n.detail = 'held by quiet period ' || q.id::text)::int AS Held
          FROM modelwatch.quiet_period q
        """;

    /// <summary>Sets a quiet period and returns its number.</summary>
    public async Task<long> CreateAsync(string model, string? check, DateTimeOffset until, string reason, string actor, DateTimeOffset now, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleAsync<long>(new CommandDefinition(
            """
            INSERT INTO modelwatch.quiet_period (model_key, check_name, until, reason, created_by, created_at)
            VALUES (@model, @check, @until, @reason, @actor, @now) RETURNING id
            """,
            new { model, check, until, reason, actor, now },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }

    /// <summary>Quiet periods in force at <paramref name="now"/> (or, with <paramref name="all"/>, every one), newest first; optionally of one model.</summary>
    public async Task<IReadOnlyList<QuietPeriod>> ListAsync(bool all, string? model, DateTimeOffset now, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<QuietPeriod>(new CommandDefinition(
            SelectSql + """
                 WHERE (@all OR (q.ended_at IS NULL AND q.until > @now))
                   AND (@model::text IS NULL OR q.model_key = @model)
                 ORDER BY q.created_at DESC, q.id DESC
                """,
            new { all, model, now },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return rows.ToList();
    }

    /// <summary>One quiet period, or null.</summary>
    public async Task<QuietPeriod?> GetAsync(long id, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleOrDefaultAsync<QuietPeriod>(new CommandDefinition(
            SelectSql + " WHERE q.id = @id", new { id }, commandTimeout: Seconds, cancellationToken: cancellationToken));
    }

    /// <summary>
    /// Ends a quiet period now. Ending one that already ended or expired changes nothing (the message says when and by
    /// whom); notifications it held stay held — <c>modelwatch alerts resend</c> sends them.
    /// </summary>
    public async Task<AlertChange> EndAsync(long id, string actor, DateTimeOffset now, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        QuietPeriod? quiet = await connection.QuerySingleOrDefaultAsync<QuietPeriod>(new CommandDefinition(
            SelectSql + " WHERE q.id = @id FOR UPDATE OF q", new { id }, transaction, Seconds, cancellationToken: cancellationToken));
        if (quiet is null)
        {
            return new AlertChange(AlertChangeKind.NotFound, $"no quiet period {id}");
        }

        switch (quiet.StateAt(now))
        {
            case "ended":
                return new AlertChange(AlertChangeKind.AlreadyDone, $"quiet period {id} already ended by {quiet.EndedBy} at {UtcText.Of(quiet.EndedAt)}");
            case "expired":
                return new AlertChange(AlertChangeKind.AlreadyDone, $"quiet period {id} already expired at {UtcText.Of(quiet.Until)}");
        }

        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE modelwatch.quiet_period SET ended_at = @now, ended_by = @actor WHERE id = @id",
            new { id, actor, now },
            transaction,
            Seconds,
            cancellationToken: cancellationToken));
        await transaction.CommitAsync(cancellationToken);
        string held = quiet.Held == 0 ? "it held no notification" : $"it held {quiet.Held} notification(s); 'modelwatch alerts resend --since {UtcText.Of(quiet.CreatedAt)}' sends them";
        return new AlertChange(AlertChangeKind.Changed, $"quiet period {id} ended by {actor}; {held}");
    }

    private int Seconds => (int)Math.Ceiling(commandTimeout.TotalSeconds);
}
