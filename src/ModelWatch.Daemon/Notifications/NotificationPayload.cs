using System.Text.Json;
using ModelWatch.Daemon.Alerts;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// The JSON body ModelWatch POSTs to a webhook target. Our own format, versioned by <c>schema</c>:
/// <code>
/// { "schema": 1, "event": "modelwatch.alert.opened", "event_id": 118, "attempt": 1, "sent_at": "...Z",
///   "alert": { "id", "model", "check", "subject", "severity", "state", "statistic", "value", "threshold",
///              "explanation", "previous_alert", "evidence_url", "p_value", "alpha", "limit", "at" } }
/// </code>
/// </summary>
public static class NotificationPayload
{
    /// <summary>The payload schema version.</summary>
    public const int Schema = 1;

    /// <summary>Serialises one alert event.</summary>
    public static byte[] Create(AlertEvent alert, DateTimeOffset sentAt, int attempt = 1)
    {
        ArgumentNullException.ThrowIfNull(alert);
        using var buffer = new MemoryStream();
        using (var writer = new Utf8JsonWriter(buffer))
        {
            writer.WriteStartObject();
            writer.WriteNumber("schema", Schema);
            writer.WriteString("event", alert.EventName);
            if (alert.EventId is { } eventId)
            {
                // The same event may arrive twice (a replica that crashed after sending, before recording): receivers dedupe on it.
                writer.WriteNumber("event_id", eventId);
            }

            // The attempt and the send time are in the body so that the signature covers them.
            writer.WriteNumber("attempt", attempt);
            writer.WriteString("sent_at", sentAt.ToUniversalTime().ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", System.Globalization.CultureInfo.InvariantCulture));
            writer.WriteStartObject("alert");
            writer.WriteNumber("id", alert.AlertId);
            writer.WriteString("model", alert.Model);
            writer.WriteString("check", alert.Check);
            writer.WriteString("subject", alert.Subject);
            writer.WriteString("severity", alert.Severity);
            writer.WriteString("state", alert.State);
            writer.WriteString("statistic", alert.Statistic);
            WriteNumber(writer, "value", alert.Value);
            WriteNumber(writer, "threshold", alert.Threshold);
            writer.WriteString("explanation", alert.Explanation);
            if (alert.PreviousAlertId is { } previous)
            {
                writer.WriteNumber("previous_alert", previous);
            }
            else
            {
                writer.WriteNull("previous_alert");
            }

            writer.WriteString("evidence_url", alert.EvidenceUrl);
            WriteNumber(writer, "p_value", alert.PValue);
            WriteNumber(writer, "alpha", alert.Alpha);
            WriteNumber(writer, "limit", alert.Limit);
            writer.WriteString("at", alert.At.ToUniversalTime().ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", System.Globalization.CultureInfo.InvariantCulture));
            writer.WriteEndObject();
            writer.WriteEndObject();
        }

        return buffer.ToArray();
    }

    private static void WriteNumber(Utf8JsonWriter writer, string name, double? value)
    {
        if (value is { } v && double.IsFinite(v))
        {
            writer.WriteNumber(name, v);
        }
        else
        {
            writer.WriteNull(name);
        }
    }
}
