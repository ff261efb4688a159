namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// Queues an alert transition's notifications in the statement that records it: one pending row in
/// <c>modelwatch.notification</c> per target the model's spec names under <c>notify</c>. The transition and its
/// notifications commit or roll back together, so a crash after the commit delays a notification but never loses it;
/// <see cref="NotificationDispatcher"/> delivers the rows later, from whichever replica claims them.
/// </summary>
internal static class NotificationQueue
{
    /// <summary>
    /// Wraps an <c>INSERT INTO modelwatch.alert_event …</c> statement (without <c>RETURNING</c>) so that it also queues
    /// the event's notifications; the statement returns the new event's id.
    /// </summary>
    public static string WithQueuedNotifications(string insertEvent) => $"""
        WITH event AS (
        {insertEvent}
        RETURNING id, alert_id, at
        ), queued AS (
            INSERT INTO modelwatch.notification (alert_event_id, alert_id, target, created_at)
            SELECT event.id, event.alert_id, t.target, event.at
              FROM event
              JOIN modelwatch.alert a ON a.id = event.alert_id
              JOIN modelwatch.model m ON m.key = a.model_key
             CROSS JOIN LATERAL jsonb_array_elements_text(COALESCE(m.spec -> 'notify', '[]'::jsonb)) AS t(target)
            ON CONFLICT DO NOTHING
        )
        SELECT id FROM event
        """;
}
