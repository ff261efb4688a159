using Dapper;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Notifications;
using Npgsql;

namespace ModelWatch.Daemon.Persistence;

/// <summary>
/// Applies one alert-policy decision to the alert table inside the run's transaction. The lifecycle
/// (docs/operations.md): one unresolved alert per (model, check, subject); <c>open</c> → <c>acknowledged</c> →
/// <c>resolved</c>; fresh critical evidence on a warning alert escalates it; evidence after a resolution opens a new
/// alert with its own number that names the one before (the old one stays resolved, so the history is never rewritten).
/// </summary>
internal static class AlertTransitions
{
    private const string FindUnresolvedSql = """
        SELECT id AS Id, severity AS Severity, state AS State
          FROM modelwatch.alert
         WHERE model_key = @model AND check_name = @check AND subject IS NOT DISTINCT FROM @subject AND state <> 'resolved'
           FOR UPDATE
        """;

    public static async Task<AlertEvent?> ApplyAsync(
        NpgsqlConnection connection, NpgsqlTransaction transaction, int timeout, string model, AlertDecision decision, long runId, string actor, DateTimeOffset now, CancellationToken cancellationToken)
    {
        CommandDefinition Command(string sql, object? args) => new(sql, args, transaction, timeout, cancellationToken: cancellationToken);
        if (decision.Action == AlertAction.None)
        {
            return null;
        }

        var current = await connection.QuerySingleOrDefaultAsync<AlertRow>(Command(FindUnresolvedSql, new { model, check = decision.Check, subject = decision.Subject }));
        string severity = decision.EffectiveSeverity == Severity.Critical ? "critical" : "warning";
        switch (decision.Action)
        {
            case AlertAction.Open or AlertAction.Raise when current is null:
            {
                // A condition that returns after resolution is a new alert with its own number that names the one before:
                // the resolved alert's history is never rewritten.
                long? previous = await connection.ExecuteScalarAsync<long?>(Command(
                    "SELECT max(id) FROM modelwatch.alert WHERE model_key = @model AND check_name = @check AND subject IS NOT DISTINCT FROM @subject",
                    new { model, check = decision.Check, subject = decision.Subject }));
                long id = await connection.QuerySingleAsync<long>(Command(
                    """
                    INSERT INTO modelwatch.alert (model_key, check_name, subject, severity, state, opened_at, opened_by, first_run_id, last_run_id, previous_alert_id, baseline_version)
                    VALUES (@model, @check, @subject, @severity, 'open', @now, @actor, @runId, @runId, @previous,
                            (SELECT baseline_version FROM modelwatch.run WHERE id = @runId))
                    RETURNING id
                    """,
                    new { model, check = decision.Check, subject = decision.Subject, severity, now, actor, runId, previous }));
                return await RecordAsync(connection, Command, id, "opened", severity, "open", model, decision, runId, actor, now, previous);
            }

            case AlertAction.Open or AlertAction.Raise:
            {
                bool escalate = current!.Severity == "warning" && severity == "critical";
                await connection.ExecuteAsync(Command(
                    "UPDATE modelwatch.alert SET last_run_id = @runId, severity = CASE WHEN @escalate THEN 'critical' ELSE severity END WHERE id = @id",
                    new { runId, escalate, id = current.Id }));
                return escalate
                    ? await RecordAsync(connection, Command, current.Id, "escalated", "critical", current.State, model, decision, runId, actor, now)
                    : null;
            }

            case AlertAction.Resolve when current is not null:
                await connection.ExecuteAsync(Command(
                    "UPDATE modelwatch.alert SET state = 'resolved', resolved_at = @now, resolved_by = @actor, last_run_id = @runId WHERE id = @id",
                    new { now, actor, runId, id = current.Id }));
                return await RecordAsync(connection, Command, current.Id, "resolved", current.Severity, "resolved", model, decision, runId, actor, now);

            default:
                return null;
        }
    }

    private static async Task<AlertEvent> RecordAsync(
        NpgsqlConnection connection, Func<string, object?, CommandDefinition> command, long alertId, string transition, string severity, string state,
        string model, AlertDecision decision, long runId, string actor, DateTimeOffset now, long? previousAlertId = null)
    {
        Finding? evidence = decision.Evidence;
        string explanation = evidence?.Explanation ?? decision.Reason;
        long eventId = await connection.ExecuteScalarAsync<long>(command(
            NotificationQueue.WithQueuedNotifications("""
                INSERT INTO modelwatch.alert_event (alert_id, transition, severity, state, run_id, actor, at, statistic, value, threshold, p_value, alpha, limit_value, explanation)
                VALUES (@alertId, @transition, @severity, @state, @runId, @actor, @now, @statistic, @value, @threshold, @pValue, @alpha, @limit, @explanation)
                """),
            new
            {
                alertId,
                transition,
                severity,
                state,
                runId,
                actor,
                now,
                statistic = evidence?.Statistic,
                value = FindingRow.Finite(evidence?.Value),
                threshold = FindingRow.Finite(evidence?.Threshold),
                pValue = FindingRow.Finite(evidence?.PValue),
                alpha = FindingRow.Finite(evidence?.Alpha),
                limit = FindingRow.Finite(evidence?.Limit),
                explanation,
            }));
        return new AlertEvent(alertId, transition, model, decision.Check, decision.Subject, severity, state, evidence?.Statistic ?? "none", FindingRow.Finite(evidence?.Value), FindingRow.Finite(evidence?.Threshold), explanation, now)
        {
            EventId = eventId,
            PreviousAlertId = previousAlertId,
            PValue = FindingRow.Finite(evidence?.PValue),
            Alpha = FindingRow.Finite(evidence?.Alpha),
            Limit = FindingRow.Finite(evidence?.Limit),
        };
    }


    private sealed class AlertRow
    {
        public long Id { get; set; }

        public string Severity { get; set; } = string.Empty;

        public string State { get; set; } = string.Empty;
    }
}
