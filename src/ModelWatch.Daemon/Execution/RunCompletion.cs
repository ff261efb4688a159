using Dapper;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Options;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Source;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Store.Models;
using Npgsql;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// Records a run under the lease (its alert transitions and their queued notifications included), then tells the
/// world: metrics, the per-model gauges (computed here, from the run and the open alerts it left), one alert event per
/// committed transition, and a nudge to the notification dispatcher. Telemetry is emitted only after the commit, so an
/// alert event is never sent for a transition that was rolled back. Called inside the run's span, so the persist span
/// and the alert events carry the run's trace id.
/// </summary>
public sealed class RunCompletion(
    RunRecorder recorder,
    NpgsqlDataSource state,
    ModelWatchMetrics metrics,
    AlertEventLogger events,
    NotificationWakeup notifications,
    IOptions<DaemonOptions> options,
    IOptions<WebOptions> web,
    TimeProvider time,
    ILogger<RunCompletion> logger)
{
    // Open alerts by model, for the gauges: recounted for a model after its own transitions, and for every model at
    // once (one query) at most every five minutes, which picks up operators' acks and resolves made elsewhere.
    private static readonly TimeSpan RecountInterval = TimeSpan.FromMinutes(5);
    private System.Collections.Concurrent.ConcurrentDictionary<string, OpenAlertCount> _openAlerts = new(StringComparer.Ordinal);
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
            DaemonLog.LogLeaseLost(logger, outcome.ModelKey, outcome.Slot);
            return recorded;
        }

        if (recorded.AlreadyRecorded)
        {
            DaemonLog.LogAlreadyRecorded(logger, outcome.ModelKey, outcome.Slot);
            return recorded;
        }

        metrics.RecordRun(outcome.ModelKey, outcome.Status, now - outcome.StartedAt, outcome.RowsRead, outcome.RowsRejected, outcome.ErrorType);
        foreach (AlertEvent transition in recorded.Transitions)
        {
            metrics.RecordAlertTransition(transition.Model, transition.Check, transition.Severity, transition.State);
            events.Publish(transition with { EvidenceUrl = web.Value.EvidenceUrl(transition.AlertId) });
        }

        if (recorded.Transitions.Count > 0)
        {
            // The transitions' notifications were queued in the same transaction; deliver them now rather than at the next poll.
            notifications.Wake();
        }

        if (recorded.Transitions.Count > 0)
        {
            _openAlerts[outcome.ModelKey] = (await CountOpenAlertsAsync(outcome.ModelKey, cancellationToken)).GetValueOrDefault(outcome.ModelKey);
        }
        else if (now.UtcTicks - Interlocked.Read(ref _countedAtTicks) > RecountInterval.Ticks)
        {
            await RecountAllAsync(now, cancellationToken);
        }

        metrics.Update(outcome.ModelKey, GaugesOf(outcome, _openAlerts.GetValueOrDefault(outcome.ModelKey), now, nextDue));
        string status = outcome.Status.Name();
        DaemonLog.LogRecorded(logger, outcome.ModelKey, outcome.Slot, status, outcome.Reason ?? "-", outcome.RowsRead, recorded.Transitions.Count);
        return recorded;
    }

    private static ModelGaugeValues GaugesOf(RunOutcome outcome, OpenAlertCount open, DateTimeOffset now, DateTimeOffset nextDue)
    {
        CheckResult? source = outcome.Results.FirstOrDefault(r => r.Check == CheckNames.Source);
        return new ModelGaugeValues(
            outcome.Measurements ?? RunMeasurements.None,
            open.Warnings,
            open.Criticals,
            open.Source > 0,
            source is null ? null : SourceCheck.Recall(source.State).ConsecutiveFailures,
            outcome.NewestRowTime,
            now,
            nextDue > outcome.Slot ? nextDue - outcome.Slot : TimeSpan.Zero);
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

    /// <summary>Unresolved alerts by model and severity (and those of the source check), of one model or (null) of every model.</summary>
    private async Task<Dictionary<string, OpenAlertCount>> CountOpenAlertsAsync(string? model, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<(string Model, string Severity, bool Source, int Count)>(new CommandDefinition(
            """
            SELECT model_key, severity, check_name = @source, count(*)::int FROM modelwatch.alert
             WHERE state <> 'resolved' AND (@model::text IS NULL OR model_key = @model::text)
             GROUP BY model_key, severity, check_name = @source
            """,
            new { model, source = CheckNames.Source },
            commandTimeout: 30,
            cancellationToken: cancellationToken));
        var counts = new Dictionary<string, OpenAlertCount>(StringComparer.Ordinal);
        foreach ((string key, string severity, bool source, int count) in rows)
        {
            OpenAlertCount c = counts.GetValueOrDefault(key);
            counts[key] = new OpenAlertCount(
                c.Warnings + (severity == "critical" ? 0 : count),
                c.Criticals + (severity == "critical" ? count : 0),
                c.Source + (source ? count : 0));
        }

        return counts;
    }
}
