using Dapper;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Options;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Store.Models;
using Npgsql;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// Records a run under the lease (its alert transitions and their queued notifications included), then tells the
/// world: metrics, per-model gauges, one alert event per committed transition, and a nudge to the notification
/// dispatcher. Telemetry is emitted only after the commit, so an alert event is never
/// sent for a transition that was rolled back.
/// </summary>
public sealed partial class RunCompletion(
    RunRecorder recorder,
    NpgsqlDataSource state,
    ModelWatchMetrics metrics,
    AlertEventLogger events,
    NotificationWakeup notifications,
    IOptions<DaemonOptions> options,
    TimeProvider time,
    ILogger<RunCompletion> logger)
{
    // Open alerts by model, for the gauges: recounted for a model after its own transitions, and for every model at
    // once (one query) at most every five minutes, which picks up operators' acks and resolves made elsewhere.
    private static readonly TimeSpan RecountInterval = TimeSpan.FromMinutes(5);
    private System.Collections.Concurrent.ConcurrentDictionary<string, (int Warnings, int Criticals)> _openAlerts = new(StringComparer.Ordinal);
    private long _countedAtTicks = DateTimeOffset.MinValue.UtcTicks;
    private int _recounting;

    /// <summary>Records the outcome and publishes what it changed; returns what was recorded.</summary>
    public async Task<RecordedRun> CompleteAsync(ModelRecord model, RunOutcome outcome, DateTimeOffset nextDue, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(outcome);
        string worker = options.Value.WorkerId;
        DateTimeOffset now = time.GetUtcNow();
        RecordedRun recorded;
        using (ModelWatchActivitySource.Instance.StartActivity("modelwatch.run.persist"))
        {
            recorded = await recorder.RecordAsync(outcome, worker, nextDue, now, cancellationToken);
        }

        if (recorded.LeaseLost)
        {
            LogLeaseLost(logger, outcome.ModelKey, outcome.Slot);
            return recorded;
        }

        if (recorded.AlreadyRecorded)
        {
            LogAlreadyRecorded(logger, outcome.ModelKey, outcome.Slot);
            return recorded;
        }

        metrics.RecordRun(outcome.ModelKey, outcome.Status, now - outcome.StartedAt, outcome.RowsRead, outcome.RowsRejected, outcome.ErrorType);
        foreach (AlertEvent transition in recorded.Transitions)
        {
            metrics.RecordAlertTransition(transition.Model, transition.Check, transition.Severity, transition.State);
            events.Publish(transition);
        }

        if (recorded.Transitions.Count > 0)
        {
            // The transitions' notifications were queued in the same transaction; deliver them now rather than at the next poll.
            notifications.Wake();
        }

        if (outcome.Gauges is { } gauges)
        {
            if (recorded.Transitions.Count > 0)
            {
                _openAlerts[outcome.ModelKey] = (await CountOpenAlertsAsync(outcome.ModelKey, cancellationToken)).GetValueOrDefault(outcome.ModelKey);
            }
            else if (now.UtcTicks - Interlocked.Read(ref _countedAtTicks) > RecountInterval.Ticks)
            {
                await RecountAllAsync(now, cancellationToken);
            }

            (int warnings, int criticals) = _openAlerts.GetValueOrDefault(outcome.ModelKey);
            metrics.Update(outcome.ModelKey, gauges with { OpenWarnings = warnings, OpenCriticals = criticals });
        }

        LogRecorded(logger, outcome.ModelKey, outcome.Slot, outcome.Status, outcome.Reason ?? "-", outcome.RowsRead, recorded.Transitions.Count);
        return recorded;
    }

    private async Task RecountAllAsync(DateTimeOffset now, CancellationToken cancellationToken)
    {
        // One run recounts; runs finishing meanwhile use the counts they find.
        if (Interlocked.CompareExchange(ref _recounting, 1, 0) != 0)
        {
            return;
        }

        try
        {
            _openAlerts = new(await CountOpenAlertsAsync(null, cancellationToken), StringComparer.Ordinal);
            Interlocked.Exchange(ref _countedAtTicks, now.UtcTicks);
        }
        finally
        {
            Interlocked.Exchange(ref _recounting, 0);
        }
    }

    /// <summary>Unresolved alerts by model and severity, of one model or (null) of every model.</summary>
    private async Task<Dictionary<string, (int Warnings, int Criticals)>> CountOpenAlertsAsync(string? model, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<(string Model, string Severity, int Count)>(new CommandDefinition(
            """
            SELECT model_key, severity, count(*)::int FROM modelwatch.alert
             WHERE state <> 'resolved' AND (@model::text IS NULL OR model_key = @model::text)
             GROUP BY model_key, severity
            """,
            new { model },
            commandTimeout: 30,
            cancellationToken: cancellationToken));
        var counts = new Dictionary<string, (int Warnings, int Criticals)>(StringComparer.Ordinal);
        foreach ((string key, string severity, int count) in rows)
        {
            (int warnings, int criticals) = counts.GetValueOrDefault(key);
            counts[key] = severity == "critical" ? (warnings, criticals + count) : (warnings + count, criticals);
        }

        return counts;
    }

    [LoggerMessage(EventId = 1301, Level = LogLevel.Warning, Message = "Model {Model}: lease lost before slot {Slot:O} was recorded; another replica owns it now, nothing was written")]
    private static partial void LogLeaseLost(ILogger logger, string model, DateTimeOffset slot);

    [LoggerMessage(EventId = 1302, Level = LogLevel.Information, Message = "Model {Model}: slot {Slot:O} was already recorded by another replica")]
    private static partial void LogAlreadyRecorded(ILogger logger, string model, DateTimeOffset slot);

    [LoggerMessage(EventId = 1303, Level = LogLevel.Information, Message = "Model {Model}: slot {Slot:O} {Status} ({Reason}); {Rows} row(s) read, {Transitions} alert transition(s)")]
    private static partial void LogRecorded(ILogger logger, string model, DateTimeOffset slot, string status, string reason, long rows, int transitions);
}
