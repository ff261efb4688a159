using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Policy;

/// <summary>The policy's decision for one (check, subject), with the evidence behind it and the state to persist.</summary>
public sealed record AlertDecision
{
    /// <summary>The check.</summary>
    public required string Check { get; init; }

    /// <summary>The subject, or null.</summary>
    public string? Subject { get; init; }

    /// <summary>What to do.</summary>
    public required AlertAction Action { get; init; }

    /// <summary>The worst finding of this run for the key (null when every finding was skipped).</summary>
    public Finding? Evidence { get; init; }

    /// <summary>
    /// Severity of the alert this decision opens or raises: critical when the critical rule is met, warning for a
    /// warning alert (<see cref="CheckThresholds.WarningAlerts"/>) or for critical evidence that has not persisted yet.
    /// Null (decisions made elsewhere) means the evidence's severity.
    /// </summary>
    public Severity? AlertSeverity { get; init; }

    /// <summary>The severity an alert gets from this decision.</summary>
    public Severity EffectiveSeverity => AlertSeverity ?? (Evidence is { Severity: Severity.Critical } ? Severity.Critical : Severity.Warning);

    /// <summary>Why, in a line.</summary>
    public required string Reason { get; init; }

    /// <summary>The state to persist for the key.</summary>
    public required AlertPolicyState State { get; init; }
}
