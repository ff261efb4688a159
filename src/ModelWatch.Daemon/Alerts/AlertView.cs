namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// An alert as operators see it: its state, who moved it, the evidence it opened with and, separately, the latest
/// evidence (the finding of its last run, which for a resolved alert is the resolving one).
/// </summary>
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

    /// <summary>Who resolved it (see <see cref="Actors"/>: a person, or a daemon replica by the policy's hysteresis).</summary>
    public string? ResolvedBy { get; set; }

    /// <summary>The run that opened it.</summary>
    public long? FirstRunId { get; set; }

    /// <summary>The latest run with evidence for it.</summary>
    public long? LastRunId { get; set; }

    /// <summary>The latest operator note.</summary>
    public string? Note { get; set; }

    /// <summary>The alert this one follows (same model, check and subject, resolved before this one opened), or null.</summary>
    public long? PreviousAlertId { get; set; }

    /// <summary>The baseline version the alert was raised against, or null when not known.</summary>
    public int? BaselineVersion { get; set; }

    /// <summary>The severity the alert opened with.</summary>
    public string OpeningSeverity { get; set; } = string.Empty;

    /// <summary>The statistic of the opening evidence.</summary>
    public string? OpeningStatistic { get; set; }

    /// <summary>Its value.</summary>
    public double? OpeningValue { get; set; }

    /// <summary>Its threshold.</summary>
    public double? OpeningThreshold { get; set; }

    /// <summary>Its p-value, where the test has one.</summary>
    public double? OpeningPValue { get; set; }

    /// <summary>The level its p-value was graded at, where there is one.</summary>
    public double? OpeningAlpha { get; set; }

    /// <summary>The value its statistic was compared with, where there is one.</summary>
    public double? OpeningLimit { get; set; }

    /// <summary>The opening explanation.</summary>
    public string OpeningExplanation { get; set; } = string.Empty;

    /// <summary>The severity of the latest evidence (<c>ok</c> once the condition has cleared), or null when its run was pruned.</summary>
    public string? LatestSeverity { get; set; }

    /// <summary>The latest evidence's p-value, where the test has one.</summary>
    public double? PValue { get; set; }

    /// <summary>The level the latest evidence's p-value was graded at, where there is one.</summary>
    public double? Alpha { get; set; }

    /// <summary>The value the latest evidence's statistic was compared with, where there is one.</summary>
    public double? Limit { get; set; }

    /// <summary>The end of the quiet period holding this alert's notifications now, or null.</summary>
    public DateTime? QuietUntil { get; set; }

    /// <summary>Statistic of the latest evidence.</summary>
    public string? Statistic { get; set; }

    /// <summary>Its value.</summary>
    public double? Value { get; set; }

    /// <summary>Its threshold.</summary>
    public double? Threshold { get; set; }

    /// <summary>The latest explanation.</summary>
    public string? Explanation { get; set; }
}
