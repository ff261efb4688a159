namespace ModelWatch.Daemon.Alerts;

/// <summary>One alert transition, as published to the logging pipeline and to notification targets.</summary>
/// <param name="AlertId">The stored alert's id.</param>
/// <param name="Transition">What happened: <c>opened</c>, <c>escalated</c>, <c>acknowledged</c>, <c>resolved</c>, <c>superseded</c>.</param>
/// <param name="Model">Model key.</param>
/// <param name="Check">Check name.</param>
/// <param name="Subject">Coefficient or feature, or null for a model-wide finding.</param>
/// <param name="Severity"><c>warning</c> or <c>critical</c>.</param>
/// <param name="State">State after the transition: <c>open</c>, <c>acknowledged</c>, <c>resolved</c>.</param>
/// <param name="Statistic">Name of the statistic that decided it.</param>
/// <param name="Value">The statistic's value.</param>
/// <param name="Threshold">The evidence finding's threshold: its alpha when a p-value graded it, else its limit.</param>
/// <param name="Explanation">The one-line explanation of the finding.</param>
/// <param name="At">When the transition happened.</param>
public sealed record AlertEvent(
    long AlertId,
    string Transition,
    string Model,
    string Check,
    string? Subject,
    string Severity,
    string State,
    string Statistic,
    double? Value,
    double? Threshold,
    string Explanation,
    DateTimeOffset At)
{
    /// <summary>The stored event's id (<c>modelwatch.alert_event</c>), or null when not known; receivers may deduplicate on it.</summary>
    public long? EventId { get; init; }

    /// <summary>For an <c>opened</c> alert whose condition came back after resolution, the alert before it; otherwise null.</summary>
    public long? PreviousAlertId { get; init; }

    /// <summary>The evidence finding's p-value, or null when it has none.</summary>
    public double? PValue { get; init; }

    /// <summary>The significance level the evidence finding's p-value was graded at, or null.</summary>
    public double? Alpha { get; init; }

    /// <summary>The value the evidence finding's statistic was compared with, in its own units, or null.</summary>
    public double? Limit { get; init; }

    /// <summary>The evidence page of this alert when <c>Web:PublicBaseUrl</c> is set; otherwise null.</summary>
    public string? EvidenceUrl { get; init; }

    /// <summary>The stable OpenTelemetry event name of this transition, e.g. <c>modelwatch.alert.opened</c>.</summary>
    public string EventName => "modelwatch.alert." + Transition;
}
