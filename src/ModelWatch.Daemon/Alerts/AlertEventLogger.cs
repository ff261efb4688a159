using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Telemetry;

namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// Writes each alert transition as a log record with a stable event name (<c>modelwatch.alert.opened</c>, ...) and
/// dotted attributes. The OpenTelemetry logger provider exports <see cref="EventId.Name"/> as the OTLP EventName,
/// so this logger must come from a pipeline that keeps it (not Serilog's OTLP sink, which drops it).
/// </summary>
public sealed class AlertEventLogger(ILogger<AlertEventLogger> logger)
{
    private static readonly Dictionary<string, int> EventIds = new(StringComparer.Ordinal)
    {
        ["opened"] = 3001,
        ["escalated"] = 3002,
        ["acknowledged"] = 3003,
        ["resolved"] = 3004,
        ["superseded"] = 3007,
    };

    /// <summary>Logs one transition.</summary>
    public void Publish(AlertEvent alert)
    {
        ArgumentNullException.ThrowIfNull(alert);
        int id = EventIds.GetValueOrDefault(alert.Transition, 3000);
        LogLevel level = alert.Severity == "critical" && alert.Transition is "opened" or "escalated" ? LogLevel.Error : LogLevel.Warning;
        var state = new List<KeyValuePair<string, object?>>
        {
            new("modelwatch.alert.id", alert.AlertId),
            new(TelemetryNames.ModelTag, alert.Model),
            new(TelemetryNames.CheckTag, alert.Check),
            new(TelemetryNames.SubjectTag, alert.Subject),
            new(TelemetryNames.SeverityTag, alert.Severity),
            new(TelemetryNames.StateTag, alert.State),
            new(TelemetryNames.StatisticTag, alert.Statistic),
            new(TelemetryNames.ValueTag, alert.Value),
            new(TelemetryNames.ThresholdTag, alert.Threshold),
            new(TelemetryNames.PValueTag, alert.PValue),
            new(TelemetryNames.AlphaTag, alert.Alpha),
            new(TelemetryNames.LimitTag, alert.Limit),
        };
        if (alert.PreviousAlertId is { } previous)
        {
            state.Add(new("modelwatch.alert.previous_id", previous));
        }

        if (alert.EvidenceUrl is { } url)
        {
            state.Add(new("modelwatch.alert.evidence_url", url));
        }

        string again = alert.PreviousAlertId is { } before ? $" (again, after #{before})" : string.Empty;
        string message = $"alert #{alert.AlertId} {alert.Transition}{again}: {alert.Model} {alert.Check}{(alert.Subject is null ? string.Empty : "/" + alert.Subject)} {alert.Severity}: {alert.Explanation}";
        logger.Log(level, new EventId(id, alert.EventName), state, null, (_, _) => message);
    }
}
