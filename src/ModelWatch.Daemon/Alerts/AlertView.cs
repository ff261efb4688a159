namespace ModelWatch.Daemon.Alerts;

/// <summary>An alert as operators see it: its state, who moved it, and the latest evidence.</summary>
public sealed class AlertView
{
    /// <summary>The alert id.</summary>
    public long Id { get; set; }

    /// <summary>Model key.</summary>
    public string Model { get; set; } = string.Empty;

    /// <summary>Check name.</summary>
    public string Check { get; set; } = string.Empty;

    /// <summary>Coefficient or feature, or null.</summary>
    public string? Subject { get; set; }

    /// <summary><c>warning</c> or <c>critical</c>.</summary>
    public string Severity { get; set; } = string.Empty;

    /// <summary><c>open</c>, <c>acknowledged</c> or <c>resolved</c>.</summary>
    public string State { get; set; } = string.Empty;

    /// <summary>When it opened (UTC).</summary>
    public DateTime OpenedAt { get; set; }

    /// <summary>Who opened it.</summary>
    public string OpenedBy { get; set; } = string.Empty;

    /// <summary>When it was acknowledged (UTC), if it was.</summary>
    public DateTime? AcknowledgedAt { get; set; }

    /// <summary>Who acknowledged it.</summary>
    public string? AcknowledgedBy { get; set; }

    /// <summary>When it was resolved (UTC), if it was.</summary>
    public DateTime? ResolvedAt { get; set; }

    /// <summary>Who resolved it (a person, or <c>daemon:&lt;worker&gt;</c> by the policy's hysteresis).</summary>
    public string? ResolvedBy { get; set; }

    /// <summary>The run that opened it.</summary>
    public long? FirstRunId { get; set; }

    /// <summary>The latest run with evidence for it.</summary>
    public long? LastRunId { get; set; }

    /// <summary>The latest operator note.</summary>
    public string? Note { get; set; }

    /// <summary>Statistic of the latest evidence.</summary>
    public string? Statistic { get; set; }

    /// <summary>Its value.</summary>
    public double? Value { get; set; }

    /// <summary>Its threshold.</summary>
    public double? Threshold { get; set; }

    /// <summary>The latest explanation.</summary>
    public string? Explanation { get; set; }
}
