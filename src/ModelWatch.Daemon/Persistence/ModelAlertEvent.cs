namespace ModelWatch.Daemon.Persistence;

/// <summary>One recorded alert transition with the alert it belongs to (Npgsql gives timestamptz as UTC DateTime).</summary>
public sealed class ModelAlertEvent
{
    /// <summary>The event's id: events of a model are read in this order.</summary>
    public long EventId { get; set; }

    /// <summary>The alert's own number.</summary>
    public long AlertId { get; set; }

    /// <summary>The alert this one follows (same model, check and subject), when the condition came back after resolution.</summary>
    public long? PreviousAlertId { get; set; }

    /// <summary>opened, escalated, acknowledged, resolved or superseded.</summary>
    public string Transition { get; set; } = string.Empty;

    /// <summary>The alert's severity after the transition.</summary>
    public string Severity { get; set; } = string.Empty;

    /// <summary>The check that raised the alert.</summary>
    public string Check { get; set; } = string.Empty;

    /// <summary>The feature or coefficient the alert is about, or null for the whole model.</summary>
    public string? Subject { get; set; }

    /// <summary>When the transition was recorded (UTC).</summary>
    public DateTime At { get; set; }

    /// <summary>Why, in words.</summary>
    public string Explanation { get; set; } = string.Empty;
}
