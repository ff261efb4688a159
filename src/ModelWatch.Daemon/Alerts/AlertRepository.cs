using Dapper;
using ModelWatch.Daemon.Notifications;
using Npgsql;

namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// Operator access to alerts: list, show, acknowledge, resolve, silence. Every change is a row in
/// <c>modelwatch.alert_event</c> with its actor and time; a human resolution also resets the alert policy's memory
/// for that (model, check, subject), so new evidence opens a fresh alert (transition <c>reopened</c>).
/// </summary>
public sealed class AlertRepository(NpgsqlDataSource dataSource, TimeSpan commandTimeout)
{
    private const string SelectSql = """
        SELECT a.id AS Id, a.model_key AS Model, a.check_name AS "Check", a.subject AS Subject, a.severity AS Severity, a.state AS State,
               a.opened_at AS OpenedAt, a.opened_by AS OpenedBy, a.acknowledged_at AS AcknowledgedAt, a.acknowledged_by AS AcknowledgedBy,
               a.resolved_at AS ResolvedAt, a.resolved_by AS ResolvedBy, a.first_run_id AS FirstRunId, a.last_run_id AS LastRunId, a.note AS Note,
               e.statistic AS Statistic, e.value AS Value, e.threshold AS Threshold, e.explanation AS Explanation
          FROM modelwatch.alert a
          LEFT JOIN LATERAL (SELECT statistic, value, threshold, explanation FROM modelwatch.alert_event
                              WHERE alert_id = a.id AND statistic IS NOT NULL ORDER BY id DESC LIMIT 1) e ON true
        """;

    /// <summary>Alerts, newest first; <paramref name="state"/> <c>unresolved</c> means open or acknowledged.</summary>
    public async Task<IReadOnlyList<AlertView>> ListAsync(string? model, string? state, int limit, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<AlertView>(new CommandDefinition(
            SelectSql + """
                 WHERE (@model::text IS NULL OR a.model_key = @model)
                   AND (@state::text IS NULL OR a.state = @state OR (@state = 'unresolved' AND a.state <> 'resolved'))
                 ORDER BY a.opened_at DESC, a.id DESC
                 LIMIT @limit
                """,
            new { model, state, limit },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return rows.ToList();
    }

    /// <summary>One alert, or null.</summary>
    public async Task<AlertView?> GetAsync(long id, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleOrDefaultAsync<AlertView>(new CommandDefinition(SelectSql + " WHERE a.id = @id", new { id }, commandTimeout: Seconds, cancellationToken: cancellationToken));
    }

    /// <summary>The alert's transitions, oldest first.</summary>
    public async Task<IReadOnlyList<AlertHistoryEntry>> HistoryAsync(long id, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        var rows = (await connection.QueryAsync<AlertHistoryEntry>(new CommandDefinition(
            """
            SELECT id AS EventId, transition AS Transition, severity AS Severity, state AS State, run_id AS RunId, actor AS Actor, at AS At,
                   statistic AS Statistic, value AS Value, threshold AS Threshold, explanation AS Explanation
              FROM modelwatch.alert_event WHERE alert_id = @id ORDER BY id
            """,
            new { id },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken))).ToList();
        var notifications = (await connection.QueryAsync<NotificationStatus>(new CommandDefinition(
            """
            SELECT n.alert_event_id AS EventId, n.target AS Target, n.state AS State, n.detail AS Detail, n.finished_at AS FinishedAt,
                   (SELECT count(*) FROM modelwatch.notification_attempt t WHERE t.alert_event = n.alert_event_id AND t.target = n.target)::int AS Attempts
              FROM modelwatch.notification n WHERE n.alert_id = @id ORDER BY n.id
            """,
            new { id },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken))).ToLookup(n => n.EventId);
        foreach (AlertHistoryEntry entry in rows)
        {
            entry.Notifications = [.. notifications[entry.EventId]];
        }

        return rows;
    }

    /// <summary>Acknowledges an open alert. Returns the problem, or null on success.</summary>
    public Task<string?> AcknowledgeAsync(long id, string actor, string? note, DateTimeOffset now, CancellationToken cancellationToken) =>
        TransitionAsync(id, "acknowledged", ["open"], actor, note, now, cancellationToken);

    /// <summary>Resolves an open or acknowledged alert. Returns the problem, or null on success.</summary>
    public Task<string?> ResolveAsync(long id, string actor, string? note, DateTimeOffset now, CancellationToken cancellationToken) =>
        TransitionAsync(id, "resolved", ["open", "acknowledged"], actor, note, now, cancellationToken);

    /// <summary>
    /// Queues again the notifications that failed or were skipped — of one alert, or created since a time — optionally
    /// only to one target; the dispatcher applies its rules afresh (a silence still in force skips them again).
    /// Returns how many were queued.
    /// </summary>
    public async Task<int> ResendAsync(long? alertId, DateTimeOffset? since, string? target, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            """
            UPDATE modelwatch.notification
               SET state = 'pending', detail = NULL, finished_at = NULL, lease_owner = NULL, lease_expires_at = NULL
             WHERE state IN ('failed', 'skipped')
               AND (@alertId::bigint IS NULL OR alert_id = @alertId::bigint)
               AND (@since::timestamptz IS NULL OR created_at >= @since::timestamptz)
               AND (@target::text IS NULL OR target = @target::text)
            """,
            new { alertId, since, target },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }

    /// <summary>Silences notifications for a model (or one of its checks) until a time; runs go on.</summary>
    public async Task<long> SilenceAsync(string model, string? check, DateTimeOffset until, string reason, string actor, DateTimeOffset now, CancellationToken cancellationToken)
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

    private async Task<string?> TransitionAsync(long id, string target, string[] from, string actor, string? note, DateTimeOffset now, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        CommandDefinition Command(string sql, object args) => new(sql, args, transaction, Seconds, cancellationToken: cancellationToken);
        var current = await connection.QuerySingleOrDefaultAsync<(string ModelKey, string CheckName, string? Subject, string Severity, string State)?>(Command(
            "SELECT model_key, check_name, subject, severity, state FROM modelwatch.alert WHERE id = @id FOR UPDATE", new { id }));
        if (current is not { } alert)
        {
            return $"alert {id} does not exist";
        }

        if (!from.Contains(alert.State))
        {
            return $"alert {id} is {alert.State}; only an alert that is {string.Join(" or ", from)} can be {target}";
        }

        string column = target == "acknowledged" ? "acknowledged" : "resolved";
        await connection.ExecuteAsync(Command(
            $"UPDATE modelwatch.alert SET state = @target, {column}_at = @now, {column}_by = @actor, note = COALESCE(@note, note) WHERE id = @id",
            new { target, now, actor, note, id }));
        await connection.ExecuteScalarAsync<long>(Command(
            NotificationQueue.WithQueuedNotifications("""
                INSERT INTO modelwatch.alert_event (alert_id, transition, severity, state, actor, at, explanation)
                VALUES (@id, @target, @severity, @target, @actor, @now, @explanation)
                """),
            new { id, target, severity = alert.Severity, actor, now, explanation = note ?? $"{target} by {actor}" }));
        if (target == "resolved")
        {
            await connection.ExecuteAsync(Command(
                """
                UPDATE modelwatch.alert_policy_state
                   SET state = state || '{"open": false, "recent": [], "consecutive_ok": 0}'::jsonb, updated_at = @now
                 WHERE model_key = @model AND check_name = @check AND subject IS NOT DISTINCT FROM @subject
                """,
                new { model = alert.ModelKey, check = alert.CheckName, subject = alert.Subject, now }));
        }

        await transaction.CommitAsync(cancellationToken);
        return null;
    }

    private int Seconds => (int)Math.Ceiling(commandTimeout.TotalSeconds);
}
