namespace ModelWatch.Daemon.Alerts;

/// <summary>Where one transition's notification to one target stands: did the pager get it?</summary>
public sealed class NotificationStatus
{
    /// <summary>The transition (<c>modelwatch.alert_event</c> id) it announces.</summary>
    public long EventId { get; set; }

    /// <summary>The target's name.</summary>
    public string Target { get; set; } = string.Empty;

    /// <summary><c>pending</c>, <c>delivered</c>, <c>failed</c> or <c>skipped</c>.</summary>
    public string State { get; set; } = string.Empty;

    /// <summary>Why it failed or was skipped, or null.</summary>
    public string? Detail { get; set; }

    /// <summary>Delivery attempts made.</summary>
    public int Attempts { get; set; }

    /// <summary>When it was delivered, given up or skipped (UTC), or null while pending.</summary>
    public DateTime? FinishedAt { get; set; }
}
