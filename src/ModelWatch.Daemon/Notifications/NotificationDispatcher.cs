using Dapper;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Options;
using Npgsql;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// Delivers the queued notifications (<c>modelwatch.notification</c>, filled by <see cref="NotificationQueue"/> in the
/// transaction of each alert transition). Claims pending rows with a lease (<c>FOR UPDATE SKIP LOCKED</c>), so replicas
/// share the work and a row whose replica died is sent by another after the lease; skips targets that are not
/// configured or whose minimum severity is not met, and models (or checks) in an active quiet period (recorded as held); signs and retries
/// through <see cref="WebhookSender"/>; records every attempt in <c>modelwatch.notification_attempt</c> and the
/// row's outcome (<c>delivered</c>, <c>failed</c>, <c>skipped</c>) on the row. Delivery is at least once: a replica
/// that dies between a target's 2xx and recording it leaves the row to be sent again, with the same <c>event_id</c>.
/// </summary>
public sealed class NotificationDispatcher(
    NotificationWakeup wakeup,
    WebhookSender sender,
    NpgsqlDataSource state,
    IOptionsMonitor<NotificationOptions> options,
    IOptions<DaemonOptions> daemon,
    IOptions<WebOptions> web,
    TimeProvider time,
    ILogger<NotificationDispatcher> logger) : BackgroundService
{
    private const int BatchSize = 20;

    private const string ClaimSql = """
        UPDATE modelwatch.notification AS n
           SET lease_owner = @worker, lease_expires_at = @expires
          FROM (SELECT id
                  FROM modelwatch.notification
                 WHERE state = 'pending' AND (lease_expires_at IS NULL OR lease_expires_at <= @now)
                 ORDER BY id
                 LIMIT @limit
                   FOR UPDATE SKIP LOCKED) AS due
         WHERE n.id = due.id
        RETURNING n.id AS Id, n.alert_event_id AS EventId, n.target AS Target
        """;

    private const string EventsSql = """
        SELECT e.id AS EventId, e.alert_id AS AlertId, e.transition AS Transition, a.model_key AS Model, a.check_name AS CheckName,
               a.subject AS Subject, e.severity AS Severity, e.state AS State, e.statistic AS Statistic, e.value AS Value,
               e.threshold AS Threshold, e.p_value AS PValue, e.alpha AS Alpha, e.limit_value AS Limit, e.explanation AS Explanation, e.at AS At,
               CASE WHEN e.transition = 'opened' THEN a.previous_alert_id END AS PreviousAlertId
          FROM modelwatch.alert_event e
          JOIN modelwatch.alert a ON a.id = e.alert_id
         WHERE e.id = ANY(@ids)
        """;

    /// <inheritdoc />
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        while (!stoppingToken.IsCancellationRequested)
        {
            try
            {
                while (await DeliverBatchAsync(stoppingToken) == BatchSize)
                {
                    // A full batch: more may be waiting.
                }
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                break;
            }
            catch (Exception ex) when (ex is not OperationCanceledException and not OutOfMemoryException)
            {
                // The rows stay pending; their leases expire and the next poll (here or on another replica) tries again.
                DaemonLog.LogDispatchFailed(logger, ex);
            }

            try
            {
                await wakeup.WaitAsync(options.CurrentValue.PollInterval, time, stoppingToken);
            }
            catch (OperationCanceledException)
            {
                break;
            }
        }
    }

    /// <summary>Claims and delivers one batch of pending notifications; returns how many were claimed.</summary>
    private async Task<int> DeliverBatchAsync(CancellationToken cancellationToken)
    {
        string worker = daemon.Value.WorkerId;
        DateTimeOffset now = time.GetUtcNow();
        List<ClaimedNotification> claimed;
        Dictionary<long, AlertEvent> events;
        await using (NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken))
        {
            claimed = [.. await connection.QueryAsync<ClaimedNotification>(Command(
                ClaimSql, new { worker, now, expires = now + options.CurrentValue.LeaseDuration, limit = BatchSize }, cancellationToken))];
            if (claimed.Count == 0)
            {
                return 0;
            }

            var rows = await connection.QueryAsync<EventRow>(Command(EventsSql, new { ids = claimed.Select(c => c.EventId).Distinct().ToArray() }, cancellationToken));
            events = rows.ToDictionary(r => r.EventId, r => r.ToEvent() with { EvidenceUrl = web.Value.EvidenceUrl(r.AlertId) });
        }

        foreach (ClaimedNotification notification in claimed)
        {
            try
            {
                // A batch to a dead target can outlast the lease it was claimed with: renew each row's lease as its
                // turn comes, and leave a row whose lease another replica has meanwhile taken.
                if (!await RenewAsync(notification.Id, worker, cancellationToken))
                {
                    continue;
                }

                (string outcome, string? detail) = await DeliverAsync(notification, events[notification.EventId], cancellationToken);
                await FinishAsync(notification.Id, worker, outcome, detail, cancellationToken);
            }
            catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
            {
                // Shutting down mid-delivery: hand the row back at once rather than after the lease.
                await ReleaseAsync(claimed.Select(c => c.Id).ToArray(), worker);
                throw;
            }
        }

        return claimed.Count;
    }

    private async Task<(string Outcome, string? Detail)> DeliverAsync(ClaimedNotification notification, AlertEvent alert, CancellationToken cancellationToken)
    {
        if (!options.CurrentValue.Targets.TryGetValue(notification.Target, out NotificationTargetOptions? target))
        {
            DaemonLog.LogUnknownTarget(logger, notification.Target, alert.Model);
            return ("skipped", "target not configured under Notifications:Targets");
        }

        if (alert.Severity == "warning" && target.MinimumSeverity == "critical")
        {
            return ("skipped", "below the target's minimum severity");
        }

        if (await QuietPeriodAsync(alert, cancellationToken) is { } quiet)
        {
            DaemonLog.LogHeldByQuietPeriod(logger, alert.AlertId, alert.Model, alert.Check, quiet);
            return ("held", $"held by quiet period {quiet.ToString(System.Globalization.CultureInfo.InvariantCulture)}");
        }

        IReadOnlyList<DeliveryAttempt> attempts = await sender.DeliverAsync(notification.Target, target, alert.AlertId, (attempt, at) => NotificationPayload.Create(alert, at, attempt), cancellationToken);
        await RecordAttemptsAsync(attempts, notification.EventId, cancellationToken);
        if (attempts[^1].Succeeded)
        {
            return ("delivered", null);
        }

        DaemonLog.LogGaveUp(logger, notification.Target, alert.AlertId, attempts.Count, attempts[^1].Error ?? "unknown error");
        return ("failed", attempts[^1].Error);
    }

    private async Task<long?> QuietPeriodAsync(AlertEvent alert, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.ExecuteScalarAsync<long?>(Command(
            """
            SELECT min(id) FROM modelwatch.quiet_period
             WHERE model_key = @model AND (check_name IS NULL OR check_name = @check) AND until > @now AND ended_at IS NULL
            """,
            new { model = alert.Model, check = alert.Check, now = time.GetUtcNow() },
            cancellationToken));
    }

    private async Task RecordAttemptsAsync(IReadOnlyList<DeliveryAttempt> attempts, long eventId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await connection.ExecuteAsync(Command(
            "INSERT INTO modelwatch.notification_attempt (alert_id, alert_event, target, attempt, at, status_code, error) VALUES (@AlertId, @EventId, @Target, @Attempt, @At, @StatusCode, @Error)",
            attempts.Select(a => new { a.AlertId, EventId = eventId, a.Target, a.Attempt, a.At, a.StatusCode, a.Error }),
            cancellationToken));
    }

    private async Task<bool> RenewAsync(long id, string worker, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        DateTimeOffset now = time.GetUtcNow();
        int renewed = await connection.ExecuteAsync(Command(
            "UPDATE modelwatch.notification SET lease_expires_at = @expires WHERE id = @id AND lease_owner = @worker AND state = 'pending'",
            new { id, worker, expires = now + options.CurrentValue.LeaseDuration },
            cancellationToken));
        return renewed == 1;
    }

    private async Task FinishAsync(long id, string worker, string outcome, string? detail, CancellationToken cancellationToken)
    {
        // Only while this replica still holds the row: one whose lease ran out may already be another replica's.
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await connection.ExecuteAsync(Command(
            """
            UPDATE modelwatch.notification
               SET state = @outcome, detail = @detail, finished_at = @now, lease_owner = NULL, lease_expires_at = NULL
             WHERE id = @id AND lease_owner = @worker
            """,
            new { id, worker, outcome, detail, now = time.GetUtcNow() },
            cancellationToken));
    }

    private async Task ReleaseAsync(long[] ids, string worker)
    {
        try
        {
            using var release = new CancellationTokenSource(TimeSpan.FromSeconds(5));
            await using NpgsqlConnection connection = await state.OpenConnectionAsync(release.Token);
            await connection.ExecuteAsync(Command(
                "UPDATE modelwatch.notification SET lease_owner = NULL, lease_expires_at = NULL WHERE id = ANY(@ids) AND lease_owner = @worker AND state = 'pending'",
                new { ids, worker },
                release.Token));
        }
        catch (Exception ex) when (ex is NpgsqlException or TimeoutException or OperationCanceledException)
        {
            DaemonLog.LogNotificationReleaseFailed(logger, ex.Message);
        }
    }

    private static CommandDefinition Command(string sql, object? args, CancellationToken cancellationToken) =>
        new(sql, args, commandTimeout: 30, cancellationToken: cancellationToken);

    /// <summary>A pending notification this replica claimed.</summary>
    private sealed record ClaimedNotification(long Id, long EventId, string Target);

    /// <summary>An alert event with its alert's model, check and subject, as stored.</summary>
    private sealed class EventRow
    {
        public long EventId { get; set; }

        public long AlertId { get; set; }

        public string Transition { get; set; } = string.Empty;

        public string Model { get; set; } = string.Empty;

        public string CheckName { get; set; } = string.Empty;

        public string? Subject { get; set; }

        public string Severity { get; set; } = string.Empty;

        public string State { get; set; } = string.Empty;

        public string? Statistic { get; set; }

        public double? Value { get; set; }

        public double? Threshold { get; set; }

        public double? PValue { get; set; }

        public double? Alpha { get; set; }

        public double? Limit { get; set; }

        public string Explanation { get; set; } = string.Empty;

        public DateTime At { get; set; }

        public long? PreviousAlertId { get; set; }

        public AlertEvent ToEvent() => new(
            AlertId, Transition, Model, CheckName, Subject, Severity, State, Statistic ?? "none", Value, Threshold, Explanation,
            new DateTimeOffset(DateTime.SpecifyKind(At, DateTimeKind.Utc)))
        {
            EventId = EventId,
            PreviousAlertId = PreviousAlertId,
            PValue = PValue,
            Alpha = Alpha,
            Limit = Limit,
        };
    }
}
