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
    private readonly System.Collections.Concurrent.ConcurrentDictionary<string, (int Warnings, int Criticals, DateTimeOffset Counted)> _openAlerts = new(StringComparer.Ordinal);

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
            // Open-alert counts change with a transition, or with an operator's command elsewhere: count them after a
            // transition, and otherwise at most every five minutes per model.
            (int warnings, int criticals, DateTimeOffset counted) = recorded.Transitions.Count > 0 || !_openAlerts.TryGetValue(outcome.ModelKey, out var known) || now - known.Counted > TimeSpan.FromMinutes(5)
                ? (await OpenAlertsAsync(outcome.ModelKey, cancellationToken) is var c ? (c.Warnings, c.Criticals, now) : default)
                : known;
            _openAlerts[outcome.ModelKey] = (warnings, criticals, counted);
            metrics.Update(outcome.ModelKey, gauges with { OpenWarnings = warnings, OpenCriticals = criticals });
        }

        LogRecorded(logger, outcome.ModelKey, outcome.Slot, outcome.Status, outcome.Reason ?? "-", outcome.RowsRead, recorded.Transitions.Count);
        return recorded;
    }

    private async Task<(int Warnings, int Criticals)> OpenAlertsAsync(string model, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var counts = await connection.QueryAsync<(string Severity, int Count)>(new CommandDefinition(
            "SELECT severity, count(*)::int FROM modelwatch.alert WHERE model_key = @model AND state <> 'resolved' GROUP BY severity",
            new { model },
            commandTimeout: 30,
            cancellationToken: cancellationToken));
        var bySeverity = counts.ToDictionary(c => c.Severity, c => c.Count, StringComparer.Ordinal);
        return (bySeverity.GetValueOrDefault("warning"), bySeverity.GetValueOrDefault("critical"));
    }

    [LoggerMessage(EventId = 1301, Level = LogLevel.Warning, Message = "Model {Model}: lease lost before slot {Slot:O} was recorded; another replica owns it now, nothing was written")]
    private static partial void LogLeaseLost(ILogger logger, string model, DateTimeOffset slot);

    [LoggerMessage(EventId = 1302, Level = LogLevel.Information, Message = "Model {Model}: slot {Slot:O} was already recorded by another replica")]
    private static partial void LogAlreadyRecorded(ILogger logger, string model, DateTimeOffset slot);

    [LoggerMessage(EventId = 1303, Level = LogLevel.Information, Message = "Model {Model}: slot {Slot:O} {Status} ({Reason}); {Rows} row(s) read, {Transitions} alert transition(s)")]
    private static partial void LogRecorded(ILogger logger, string model, DateTimeOffset slot, string status, string reason, long rows, int transitions);
}
