using Dapper;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Options;
using Npgsql;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// Delivers queued alert transitions to their webhook targets: skips targets whose minimum severity is not met and
/// models (or checks) under an active silence, signs and retries through <see cref="WebhookSender"/>, and records
/// every attempt in <c>modelwatch.notification_attempt</c>.
/// </summary>
public sealed partial class NotificationDispatcher(
    NotificationOutbox queue,
    WebhookSender sender,
    NpgsqlDataSource state,
    IOptionsMonitor<NotificationOptions> options,
    TimeProvider time,
    ILogger<NotificationDispatcher> logger) : BackgroundService
{
    /// <inheritdoc />
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        try
        {
            await foreach ((AlertEvent alert, IReadOnlyList<string> targets) in queue.Reader.ReadAllAsync(stoppingToken))
            {
                try
                {
                    await DispatchAsync(alert, targets, stoppingToken);
                }
                catch (Exception ex) when (ex is NpgsqlException or HttpRequestException or TimeoutException)
                {
                    LogDispatchFailed(logger, ex, alert.AlertId);
                }
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            // Shutting down: undelivered notifications are logged as alert events already.
        }
    }

    private async Task DispatchAsync(AlertEvent alert, IReadOnlyList<string> targets, CancellationToken cancellationToken)
    {
        if (await IsSilencedAsync(alert, cancellationToken))
        {
            LogSilenced(logger, alert.AlertId, alert.Model, alert.Check);
            return;
        }

        byte[] body = NotificationPayload.Create(alert, time.GetUtcNow());
        foreach (string name in targets)
        {
            if (!options.CurrentValue.Targets.TryGetValue(name, out NotificationTargetOptions? target))
            {
                LogUnknownTarget(logger, name, alert.Model);
                continue;
            }

            if (alert.Severity == "warning" && target.MinimumSeverity == "critical")
            {
                continue;
            }

            IReadOnlyList<DeliveryAttempt> attempts = await sender.DeliverAsync(name, target, alert.AlertId, body, cancellationToken);
            await RecordAsync(attempts, cancellationToken);
            if (!attempts[^1].Succeeded)
            {
                LogGaveUp(logger, name, alert.AlertId, attempts.Count, attempts[^1].Error ?? "unknown error");
            }
        }
    }

    private async Task<bool> IsSilencedAsync(AlertEvent alert, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.ExecuteScalarAsync<bool>(new CommandDefinition(
            "SELECT EXISTS (SELECT 1 FROM modelwatch.silence WHERE model_key = @model AND (check_name IS NULL OR check_name = @check) AND until > @now)",
            new { model = alert.Model, check = alert.Check, now = time.GetUtcNow() },
            commandTimeout: 30,
            cancellationToken: cancellationToken));
    }

    private async Task RecordAsync(IReadOnlyList<DeliveryAttempt> attempts, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "INSERT INTO modelwatch.notification_attempt (alert_id, target, attempt, at, status_code, error) VALUES (@AlertId, @Target, @Attempt, @At, @StatusCode, @Error)",
            attempts,
            commandTimeout: 30,
            cancellationToken: cancellationToken));
    }

    [LoggerMessage(EventId = 1201, Level = LogLevel.Warning, Message = "Notification for alert {AlertId} could not be dispatched")]
    private static partial void LogDispatchFailed(ILogger logger, Exception exception, long alertId);

    [LoggerMessage(EventId = 1202, Level = LogLevel.Information, Message = "Alert {AlertId} ({Model}/{Check}) is silenced; no notification sent")]
    private static partial void LogSilenced(ILogger logger, long alertId, string model, string check);

    [LoggerMessage(EventId = 1203, Level = LogLevel.Warning, Message = "Notification target {Target} named by model {Model} is not configured under Notifications:Targets")]
    private static partial void LogUnknownTarget(ILogger logger, string target, string model);

    [LoggerMessage(EventId = 1204, Level = LogLevel.Error, Message = "Target {Target} did not accept alert {AlertId} after {Attempts} attempt(s): {Error}")]
    private static partial void LogGaveUp(ILogger logger, string target, long alertId, int attempts, string error);
}
