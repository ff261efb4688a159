using Dapper;
using ModelWatch.Daemon.Notifications;
using Npgsql;

namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// Operator access to alerts: list, show, acknowledge, resolve, resend. Every change is a row in
/// <c>modelwatch.alert_event</c> with its actor and time; a human resolution also resets the alert policy's memory
/// for that (model, check, subject), so new evidence opens a new alert that names this one as its predecessor.
/// Acknowledge and resolve are idempotent: asking for a state the alert already has (or is past) changes nothing.
/// </summary>
public sealed class AlertRepository(NpgsqlDataSource dataSource, TimeSpan commandTimeout, TimeProvider? time = null)
{
    // Opening evidence: the alert's first event. Latest evidence: the alert's own finding in its last run (for a
    // resolved alert, the resolving one), else — when that run was pruned — the last event that carried a statistic.
    private const string SelectSql = """
        SELECT a.id AS Id, a.model_key AS Model, a.check_name AS "Check", a.subject AS Subject, a.severity AS Severity, a.state AS State,
               a.opened_at AS OpenedAt, a.opened_by AS OpenedBy, a.acknowledged_at AS AcknowledgedAt, a.acknowledged_by AS AcknowledgedBy,
               a.resolved_at AS ResolvedAt, a.resolved_by AS ResolvedBy, a.first_run_id AS FirstRunId, a.last_run_id AS LastRunId, a.note AS Note,
               a.previous_alert_id AS PreviousAlertId, a.baseline_version AS BaselineVersion,
               COALESCE(o.severity, a.severity) AS OpeningSeverity, o.statistic AS OpeningStatistic, o.value AS OpeningValue,
               o.threshold AS OpeningThreshold, o.p_value AS OpeningPValue, o.alpha AS OpeningAlpha, o.limit_value AS OpeningLimit,
               COALESCE(o.explanation, '') AS OpeningExplanation,
               f.severity AS LatestSeverity,
               COALESCE(f.statistic, e.statistic) AS Statistic, CASE WHEN f.statistic IS NULL THEN e.value ELSE f.value END AS Value,
               CASE WHEN f.statistic IS NULL THEN e.threshold ELSE f.threshold END AS Threshold,
               CASE WHEN f.statistic IS NULL THEN e.p_value ELSE f.p_value END AS PValue,
               CASE WHEN f.statistic IS NULL THEN e.alpha ELSE f.alpha END AS Alpha,
               CASE WHEN f.statistic IS NULL THEN e.limit_value ELSE f.limit_value END AS "Limit",
               COALESCE(f.explanation, e.explanation) AS Explanation,
               q.until AS QuietUntil
          FROM modelwatch.alert a
          LEFT JOIN LATERAL (SELECT severity, statistic, value, threshold, p_value, alpha, limit_value, explanation FROM modelwatch.alert_event
                              WHERE alert_id = a.id ORDER BY id LIMIT 1) o ON true
          LEFT JOIN LATERAL (SELECT severity, statistic, value, threshold, p_value, alpha, limit_value, explanation FROM modelwatch.finding
                              WHERE run_id = a.last_run_id AND check_name = a.check_name AND subject IS NOT DISTINCT FROM a.subject
                              ORDER BY CASE severity WHEN 'critical' THEN 2 WHEN 'warning' THEN 1 ELSE 0 END DESC, id LIMIT 1) f ON true
          LEFT JOIN LATERAL (SELECT statistic, value, threshold, p_value, alpha, limit_value, explanation FROM modelwatch.alert_event
                              WHERE alert_id = a.id AND statistic IS NOT NULL ORDER BY id DESC LIMIT 1) e ON true
          LEFT JOIN LATERAL (SELECT max(until) AS until FROM modelwatch.quiet_period
                              WHERE model_key = a.model_key AND (check_name IS NULL OR check_name = a.check_name)
                                AND ended_at IS NULL AND until > @now) q ON true
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
            new { model, state, limit, now = Now },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
        return rows.ToList();
    }

    /// <summary>One alert, or null.</summary>
    public async Task<AlertView?> GetAsync(long id, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleOrDefaultAsync<AlertView>(new CommandDefinition(SelectSql + " WHERE a.id = @id", new { id, now = Now }, commandTimeout: Seconds, cancellationToken: cancellationToken));
    }

    /// <summary>The alert's transitions, oldest first.</summary>
    public async Task<IReadOnlyList<AlertHistoryEntry>> HistoryAsync(long id, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        var rows = (await connection.QueryAsync<AlertHistoryEntry>(new CommandDefinition(
            """
            SELECT id AS EventId, transition AS Transition, severity AS Severity, state AS State, run_id AS RunId, actor AS Actor, at AS At,
                   statistic AS Statistic, value AS Value, threshold AS Threshold, p_value AS PValue, alpha AS Alpha, limit_value AS "Limit",
                   explanation AS Explanation
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

    /// <summary>Acknowledges an open alert; an acknowledged or resolved one is left as it is.</summary>
    public Task<AlertChange> AcknowledgeAsync(long id, string actor, string? note, DateTimeOffset now, CancellationToken cancellationToken) =>
        TransitionAsync(id, "acknowledged", actor, note, now, cancellationToken);

    /// <summary>Resolves an open or acknowledged alert; a resolved one is left as it is.</summary>
    public Task<AlertChange> ResolveAsync(long id, string actor, string? note, DateTimeOffset now, CancellationToken cancellationToken) =>
        TransitionAsync(id, "resolved", actor, note, now, cancellationToken);

    /// <summary>
    /// Queues again the notifications that failed or were skipped — of one alert, or created since a time — optionally
    /// only to one target; the dispatcher applies its rules afresh (a quiet period still in force holds them again).
    /// Returns how many were queued.
    /// </summary>
    public async Task<int> ResendAsync(long? alertId, DateTimeOffset? since, string? target, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            """
            UPDATE modelwatch.notification
               SET state = 'pending', detail = NULL, finished_at = NULL, lease_owner = NULL, lease_expires_at = NULL
             WHERE state IN ('failed', 'skipped', 'held')
               AND (@alertId::bigint IS NULL OR alert_id = @alertId::bigint)
               AND (@since::timestamptz IS NULL OR created_at >= @since::timestamptz)
               AND (@target::text IS NULL OR target = @target::text)
            """,
            new { alertId, since, target },
            commandTimeout: Seconds,
            cancellationToken: cancellationToken));
    }

    private async Task<AlertChange> TransitionAsync(long id, string target, string actor, string? note, DateTimeOffset now, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await dataSource.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        CommandDefinition Command(string sql, object args) => new(sql, args, transaction, Seconds, cancellationToken: cancellationToken);
        var current = await connection.QuerySingleOrDefaultAsync<CurrentAlert>(Command(
            """
            SELECT model_key AS ModelKey, check_name AS CheckName, subject AS Subject, severity AS Severity, state AS State,
                   acknowledged_by AS AcknowledgedBy, acknowledged_at AS AcknowledgedAt, resolved_by AS ResolvedBy, resolved_at AS ResolvedAt
              FROM modelwatch.alert WHERE id = @id FOR UPDATE
            """,
            new { id }));
        if (current is not { } alert)
        {
            return new AlertChange(AlertChangeKind.NotFound, $"no alert #{id}");
        }

        if (alert.State == "resolved")
        {
            string done = $"resolved by {alert.ResolvedBy} at {UtcText.Of(alert.ResolvedAt)}";
            return new AlertChange(AlertChangeKind.AlreadyDone, target == "resolved"
                ? $"alert #{id} already {done}"
                : $"alert #{id} is already {done}; nothing to acknowledge");
        }

        if (target == "acknowledged" && alert.State == "acknowledged")
        {
            return new AlertChange(AlertChangeKind.AlreadyDone, $"alert #{id} already acknowledged by {alert.AcknowledgedBy} at {UtcText.Of(alert.AcknowledgedAt)}");
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
await AlertPolicyMemory.ResetAsync(connection, transaction, Seconds, alert.ModelKey, alert.CheckName, alert.Subject, now, cancellationToken);
        }

        await transaction.CommitAsync(cancellationToken);
        return new AlertChange(AlertChangeKind.Changed, $"alert #{id} {target} by {actor}");
    }

    private DateTimeOffset Now => (time ?? TimeProvider.System).GetUtcNow();

    private sealed class CurrentAlert
    {
        public string ModelKey { get; set; } = string.Empty;

        public string CheckName { get; set; } = string.Empty;

        public string? Subject { get; set; }

        public string Severity { get; set; } = string.Empty;

        public string State { get; set; } = string.Empty;

        public string? AcknowledgedBy { get; set; }

        public DateTime? AcknowledgedAt { get; set; }

        public string? ResolvedBy { get; set; }

        public DateTime? ResolvedAt { get; set; }
    }

    private int Seconds => (int)Math.Ceiling(commandTimeout.TotalSeconds);
}
