namespace ModelWatch.Daemon.Alerts;

/// <summary>One recorded transition of an alert.</summary>
public sealed class AlertHistoryEntry
{
    /// <summary>The stored event's id (the <c>event_id</c> of its notifications).</summary>
    public long EventId { get; set; }

    /// <summary>opened, escalated, acknowledged, resolved, superseded.</summary>
    public string Transition { get; set; } = string.Empty;

    /// <summary>Severity at the time.</summary>
    public string Severity { get; set; } = string.Empty;

    /// <summary>State after the transition.</summary>
    public string State { get; set; } = string.Empty;

    /// <summary>The run behind it, for policy transitions.</summary>
    public long? RunId { get; set; }

    /// <summary>Who made it.</summary>
    public string Actor { get; set; } = string.Empty;

    /// <summary>When (UTC).</summary>
    public DateTime At { get; set; }

    /// <summary>Statistic of the evidence.</summary>
    public string? Statistic { get; set; }

    /// <summary>Its value.</summary>
    public double? Value { get; set; }

    /// <summary>Its threshold.</summary>
    public double? Threshold { get; set; }

    /// <summary>The evidence's p-value, where the test has one.</summary>
    public double? PValue { get; set; }

    /// <summary>The level that p-value was graded at, where there is one.</summary>
    public double? Alpha { get; set; }

    /// <summary>The value the statistic was compared with, where there is one.</summary>
    public double? Limit { get; set; }

    /// <summary>Explanation or operator note.</summary>
    public string Explanation { get; set; } = string.Empty;

    /// <summary>The notifications this transition queued, one per target the model's spec names.</summary>
    public IReadOnlyList<NotificationStatus> Notifications { get; set; } = [];
}
