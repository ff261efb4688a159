using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Policy;

/// <summary>The alert policy's memory for one model's (check, subject): a plain document the daemon persists.</summary>
public sealed record AlertPolicyState
{
    /// <summary>Version of this document's shape.</summary>
    public int SchemaVersion { get; init; } = 1;

    /// <summary>The check.</summary>
    public required string Check { get; init; }

    /// <summary>The subject (null for the model as a whole).</summary>
    public string? Subject { get; init; }

    /// <summary>Baseline the history belongs to; a new baseline clears the history.</summary>
    public string? BaselineFingerprint { get; init; }

    /// <summary>Severities of the most recent evaluated runs from tests that need persistence, oldest first.</summary>
    public IReadOnlyList<Severity> Recent { get; init; } = [];

    /// <summary>True while an alert is open for this key.</summary>
    public bool Open { get; init; }

    /// <summary>Consecutive evaluated runs with nothing above ok while open.</summary>
    public int ConsecutiveOk { get; init; }
}
