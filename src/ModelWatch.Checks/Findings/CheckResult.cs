namespace ModelWatch.Checks.Findings;

/// <summary>What one check produced for one run: its findings and the sequential state to persist for next time.</summary>
public sealed record CheckResult
{
    /// <summary>The check.</summary>
    public required string Check { get; init; }

    /// <summary>Findings, skipped ones included.</summary>
    public required IReadOnlyList<Finding> Findings { get; init; }

    /// <summary>The state to persist for this model and check.</summary>
    public required CheckState State { get; init; }

    /// <summary>True when the whole check was skipped (for example <c>insufficient_data</c>).</summary>
    public bool Skipped { get; init; }

    /// <summary>Why the check was skipped.</summary>
    public string? SkipReason { get; init; }

    /// <summary>The worst severity among findings that ran.</summary>
    public Severity Severity => Findings.Where(f => !f.Skipped).Select(f => f.Severity).DefaultIfEmpty(Severity.Ok).Max();
}
